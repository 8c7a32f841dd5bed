/**
 * The templates a new study can start from: the study files in examples/, bundled with the
 * app. Title and description come from each file.
 */
import type { Study } from '../src/index.ts';

const files = import.meta.glob('../examples/*.ratebook.json', { eager: true, import: 'default' }) as Record<string, Study>;

export interface Template {
  readonly key: string;
  readonly title: string;
  readonly description: string;
  readonly doc: Study;
}

export const TEMPLATES: readonly Template[] = Object.entries(files)
  .map(([path, doc]) => ({ key: path.split('/').pop()!.replace('.ratebook.json', ''), title: doc.title, description: firstSentence(doc.description ?? ''), doc }))
  .sort((a, b) => a.title.localeCompare(b.title));

function firstSentence(text: string): string {
  const m = /^(.*?[.!?])(\s|$)/.exec(text.replace(/^Demo scenario with invented numbers[.:]?\s*/i, ''));
  const first = m ? m[1] : text;
  return first.charAt(0).toUpperCase() + first.slice(1);
}
