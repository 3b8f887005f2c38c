// Every fast-check property in the unit project starts from one fixed seed, so a CI run is
// reproducible and a red run can be replayed exactly; PROPERTY_SEED picks another seed, and the
// nightly property script (PROPERTY_RUNS set) explores fresh ones.
import fc from 'fast-check';

const requested = Number(process.env.PROPERTY_SEED);
if (Number.isInteger(requested)) fc.configureGlobal({ seed: requested });
else if (!process.env.PROPERTY_RUNS) fc.configureGlobal({ seed: 20261201 });
