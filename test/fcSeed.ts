// Property tests run with a fixed seed so that every CI run checks the same inputs and a failure reproduces;
// FC_SEED=random (or FC_SEED=<integer>) explores other inputs locally. Imported first by each property test.
import fc from 'fast-check';

const env = process.env.FC_SEED;
/** The seed in use (printed by fast-check with any counterexample). */
export const FC_SEED = env === 'random' ? Date.now() | 0 : env ? Number(env) : 20261202;
fc.configureGlobal({ seed: FC_SEED });
