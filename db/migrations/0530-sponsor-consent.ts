import type { MigrationContext } from "../migrate";

// Consent and sponsors. A sponsor link gains its own flag for outcomes (Solid / Shaky / Not yet of
// oral checks and stage-check results), apart from milestones (shares_progress). A student may
// carry a date of birth: while under 18 (lib/sharing/consent.ts) the school, not the student,
// manages their sponsor links. Every change of a link's flags is written to the audit trail.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE sponsor_links ADD COLUMN shares_outcomes boolean NOT NULL DEFAULT true;
    ALTER TABLE people ADD COLUMN birth_date date;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE sponsor_links DROP COLUMN IF EXISTS shares_outcomes;
    ALTER TABLE people DROP COLUMN IF EXISTS birth_date;
  `);
}
