/**
 * The page's one script: defines the app's elements and registers the offline service
 * worker. A file of its own, because the content security policy allows no inline script.
 */
import './app.ts';
import { registerServiceWorker } from './register-sw.ts';

void registerServiceWorker();
