// The software version stored with every calibration and run, so a result says which code made it.
import packageJson from "@/package.json";

/** The software version stored with every calibration and run (package.json's version). */
export const SOFTWARE_VERSION: string = packageJson.version;
