/**
 * The one place that creates the mathjs instance. Only the parser and the unit table are
 * taken: Ratebook never evaluates with mathjs, so nothing a study writes can reach mathjs's
 * evaluate, import or createUnit.
 */
import { create, parseDependencies, unitDependencies } from 'mathjs';

export const math = create({ parseDependencies, unitDependencies }, { number: 'number' });
