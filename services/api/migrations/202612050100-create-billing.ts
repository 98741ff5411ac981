import type { Migration } from '../src/db/migrator';

/**
 * Billing of partner institutions: rate cards with effective dates, invoice runs, invoices
 * (numbered without gaps per year, immutable once issued), which ledger entries each invoice
 * bills (an entry is billed once), and the Stripe events received (each processed once).
 */
export const up: Migration['up'] = async ({ sequelize }) => {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `
      CREATE TABLE rate_cards (
        id uuid PRIMARY KEY,
        institution_id uuid NOT NULL REFERENCES institutions(id) ON DELETE RESTRICT,
        currency char(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        unit_price_minor bigint NOT NULL CHECK (unit_price_minor >= 0),
        tiers jsonb NOT NULL DEFAULT '[]',
        discount_basis_points integer NOT NULL DEFAULT 0 CHECK (discount_basis_points BETWEEN 0 AND 10000),
        tax_rate_basis_points integer NOT NULL CHECK (tax_rate_basis_points BETWEEN 0 AND 10000),
        reverse_charge boolean NOT NULL DEFAULT false,
        payment_terms_days integer NOT NULL CHECK (payment_terms_days BETWEEN 0 AND 365),
        effective_from date NOT NULL,
        effective_to date,
        created_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        UNIQUE (institution_id, effective_from),
        CHECK (effective_to IS NULL OR effective_to >= effective_from)
      );

      CREATE TABLE invoice_runs (
        id uuid PRIMARY KEY,
        period_from date NOT NULL,
        period_to date NOT NULL CHECK (period_to >= period_from),
        state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'running', 'done', 'failed')),
        drafted integer NOT NULL DEFAULT 0,
        error text,
        started_by_person_id uuid REFERENCES people(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        finished_at timestamptz
      );

      -- Gapless numbers: the year's counter row is locked while an invoice takes the next one.
      CREATE TABLE invoice_numbers (
        year integer PRIMARY KEY,
        last integer NOT NULL CHECK (last >= 0)
      );

      CREATE TABLE invoices (
        id uuid PRIMARY KEY,
        institution_id uuid NOT NULL REFERENCES institutions(id) ON DELETE RESTRICT,
        run_id uuid REFERENCES invoice_runs(id) ON DELETE RESTRICT,
        number text UNIQUE,
        state text NOT NULL DEFAULT 'draft' CHECK (state IN ('draft', 'issued', 'paid', 'void')),
        currency char(3) NOT NULL,
        period_from date NOT NULL,
        period_to date NOT NULL,
        rate_card jsonb NOT NULL,
        lines jsonb NOT NULL,
        subtotal_minor bigint NOT NULL,
        discount_minor bigint NOT NULL,
        tax_minor bigint NOT NULL,
        total_minor bigint NOT NULL CHECK (total_minor = subtotal_minor - discount_minor + tax_minor),
        issued_on date,
        due_on date,
        paid_at timestamptz,
        voided_at timestamptz,
        void_reason text,
        credit_note_number text UNIQUE,
        payment_reference text,
        payment_state text CHECK (payment_state IN ('pending', 'failed', 'succeeded')),
        stripe_invoice_id text UNIQUE,
        hosted_payment_url text,
        pdf_object_key text,
        reminded_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        -- Issued and paid invoices have their number; a draft has none; a voided draft never got one.
        CHECK (state IN ('draft', 'void') OR number IS NOT NULL),
        CHECK (state <> 'draft' OR number IS NULL),
        CHECK ((state = 'void') = (void_reason IS NOT NULL)),
        CHECK ((state = 'paid') = (paid_at IS NOT NULL))
      );
      CREATE INDEX invoices_institution ON invoices (institution_id, created_at DESC);

      -- An issued invoice's figures never change: only its state, payment and PDF fields may.
      CREATE FUNCTION invoices_issued_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF OLD.state <> 'draft' AND (NEW.number IS DISTINCT FROM OLD.number OR NEW.lines IS DISTINCT FROM OLD.lines
            OR NEW.total_minor <> OLD.total_minor OR NEW.subtotal_minor <> OLD.subtotal_minor OR NEW.tax_minor <> OLD.tax_minor
            OR NEW.discount_minor <> OLD.discount_minor OR NEW.currency <> OLD.currency OR NEW.rate_card IS DISTINCT FROM OLD.rate_card
            OR NEW.issued_on IS DISTINCT FROM OLD.issued_on OR NEW.due_on IS DISTINCT FROM OLD.due_on) THEN
          RAISE EXCEPTION 'an issued invoice cannot be changed';
        END IF;
        IF TG_OP = 'UPDATE' AND OLD.state IN ('paid', 'void') AND NEW.state <> OLD.state THEN
          RAISE EXCEPTION 'a % invoice cannot become %', OLD.state, NEW.state;
        END IF;
        RETURN NEW;
      END $$;
      CREATE TRIGGER invoices_immutable BEFORE UPDATE ON invoices FOR EACH ROW EXECUTE FUNCTION invoices_issued_immutable();
      CREATE FUNCTION invoices_no_delete_issued() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF OLD.state <> 'draft' THEN RAISE EXCEPTION 'an issued invoice cannot be deleted'; END IF;
        RETURN OLD;
      END $$;
      CREATE TRIGGER invoices_keep_issued BEFORE DELETE ON invoices FOR EACH ROW EXECUTE FUNCTION invoices_no_delete_issued();

      -- Which ledger entries an invoice bills: an entry is on one invoice at most, so a second run adds only what is new.
      CREATE TABLE invoice_entries (
        ledger_entry_id bigint PRIMARY KEY REFERENCES ledger_entries(id) ON DELETE RESTRICT,
        invoice_id uuid NOT NULL REFERENCES invoices(id) ON DELETE CASCADE
      );
      CREATE INDEX invoice_entries_invoice ON invoice_entries (invoice_id);

      CREATE TABLE stripe_events (
        id text PRIMARY KEY,
        type text NOT NULL,
        created_at timestamptz NOT NULL,
        received_at timestamptz NOT NULL DEFAULT now()
      );

      ALTER TABLE institutions ADD COLUMN stripe_customer_id text UNIQUE;
      `,
      { transaction },
    );
  });
};

export const down: Migration['down'] = async ({ sequelize }) => {
  await sequelize.query(`
    ALTER TABLE institutions DROP COLUMN IF EXISTS stripe_customer_id;
    DROP TABLE IF EXISTS stripe_events, invoice_entries, invoices, invoice_numbers, invoice_runs, rate_cards;
    DROP FUNCTION IF EXISTS invoices_issued_immutable, invoices_no_delete_issued;
  `);
};
