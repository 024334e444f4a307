import type { MigrationContext } from "../migrate";

// Mail: one-time set-password links, the delivery row of each outbox mail, the instructor's
// note for a sponsor's Weekly letter, and unsubscribes (sponsor × student × kind).
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE TABLE set_password_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      person_id uuid NOT NULL REFERENCES people(id),
      -- only the SHA-256 of the token is kept; the token itself lives in the mail alone
      token_hash text NOT NULL UNIQUE CHECK (length(token_hash) = 64),
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX set_password_tokens_person_idx ON set_password_tokens (person_id);

    -- Exactly one delivery row per outbox mail, written in the transaction that marks it sent.
    CREATE TABLE mail_deliveries (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      outbox_id uuid NOT NULL UNIQUE REFERENCES outbox(id),
      message_id text NOT NULL,
      smtp_response text NOT NULL DEFAULT '',
      attempts integer NOT NULL,
      delivered_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE sponsor_notes (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      author_id uuid NOT NULL REFERENCES people(id),
      body text NOT NULL CHECK (length(body) BETWEEN 1 AND 2000),
      created_at timestamptz NOT NULL DEFAULT now(),
      -- the letter that carried the note; null until a letter has been written with it
      used_in_letter_at timestamptz
    );
    CREATE INDEX sponsor_notes_student_idx ON sponsor_notes (student_id, created_at DESC);

    CREATE TABLE mail_unsubscribes (
      sponsor_id uuid NOT NULL REFERENCES people(id),
      student_id uuid NOT NULL REFERENCES people(id),
      kind text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (sponsor_id, student_id, kind)
    );
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP TABLE IF EXISTS mail_unsubscribes, sponsor_notes, mail_deliveries, set_password_tokens`);
}
