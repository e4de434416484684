// A production package's licence as the check reads it: the installed package.json's (which may give it
// in the old "licenses" array, which npm does not copy into the lockfile); a package of another platform
// is not installed, so the lockfile's copy of it.
import fs from "node:fs";
import path from "node:path";
import { licenceOfManifest, type Lockfile, type ProductionPackage } from "./licence-policy";

export function installedLicence(
  root: string,
  lock: Lockfile,
): (pkg: ProductionPackage) => string | null {
  return (pkg) => {
    const manifestPath = path.join(root, pkg.path, "package.json");
    if (fs.existsSync(manifestPath))
      return licenceOfManifest(
        JSON.parse(fs.readFileSync(manifestPath, "utf8")) as Record<string, unknown>,
      );
    return licenceOfManifest({ license: lock.packages?.[pkg.path]?.license });
  };
}
