// An instrument's export profile: what the first column of its exported files holds (pixel indices
// counted from 0 or 1, nm, Å or cm⁻¹) and, for wavelengths, air or vacuum. Files without a header
// are read through it; null until a lab lead sets it or the first upload that says proposes it.
import type { Migration } from "../migrate";

export const up: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE instruments
      ADD COLUMN export_x_unit text
        CHECK (export_x_unit IN ('pixel-from-0', 'pixel-from-1', 'nm', 'angstrom', 'wavenumber')),
      ADD COLUMN export_medium text CHECK (export_medium IN ('air', 'vacuum')),
      ADD CONSTRAINT instruments_export_medium_of_wavelengths
        CHECK (export_medium IS NULL OR export_x_unit IN ('nm', 'angstrom'));
  `);
};

export const down: Migration = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE instruments
      DROP CONSTRAINT IF EXISTS instruments_export_medium_of_wavelengths,
      DROP COLUMN IF EXISTS export_medium,
      DROP COLUMN IF EXISTS export_x_unit;
  `);
};
