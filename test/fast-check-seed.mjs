// Loaded before the engine tests (see scripts/run-node-tests.mjs): property tests draw their random
// cases from a fixed seed, so a run of `npm test` is repeatable and CI never fails on a case no one
// has seen before. RATEBOOK_SEED=random explores new cases (fast-check prints the seed of a failure,
// and RATEBOOK_SEED=<that seed> replays it); fix what it finds and add the case as a plain test.
import fc from 'fast-check';

const chosen = process.env.RATEBOOK_SEED;
if (chosen !== 'random') {
  const seed = chosen === undefined || chosen === '' ? 20261202 : Number(chosen);
  if (!Number.isInteger(seed)) throw new Error(`RATEBOOK_SEED must be an integer or "random"; it is "${chosen}"`);
  fc.configureGlobal({ seed });
}
