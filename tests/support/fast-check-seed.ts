// Property tests run with one fixed seed so that CI is repeatable; set FC_SEED to explore others
// (`FC_SEED=random` draws a new seed every run).
import fc from "fast-check";

const requested = process.env.FC_SEED;
if (requested !== "random") fc.configureGlobal({ seed: requested ? Number(requested) : 20261201 });
