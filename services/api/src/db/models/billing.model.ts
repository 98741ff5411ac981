import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A partner's prices from a date on; a newer card closes the one before (effectiveTo). */
export class RateCardRow extends Model<InferAttributes<RateCardRow>, InferCreationAttributes<RateCardRow>> {
  declare id: CreationOptional<string>;
  declare institutionId: string;
  declare currency: string;
  /** BIGINT: pg returns a string. */
  declare unitPriceMinor: number | string;
  declare tiers: { fromCoreHours: number; unitPriceMinor: number }[];
  declare discountBasisPoints: number;
  declare taxRateBasisPoints: number;
  declare reverseCharge: boolean;
  declare paymentTermsDays: number;
  declare effectiveFrom: string;
  declare effectiveTo: string | null;
  declare createdByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    RateCardRow.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        institutionId: { type: DataTypes.UUID, allowNull: false },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        unitPriceMinor: { type: DataTypes.BIGINT, allowNull: false },
        tiers: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        discountBasisPoints: { type: DataTypes.INTEGER, allowNull: false },
        taxRateBasisPoints: { type: DataTypes.INTEGER, allowNull: false },
        reverseCharge: { type: DataTypes.BOOLEAN, allowNull: false },
        paymentTermsDays: { type: DataTypes.INTEGER, allowNull: false },
        effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
        effectiveTo: { type: DataTypes.DATEONLY, allowNull: true },
        createdByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'rate_cards' },
    );
  }
}

/** One invoice run: a period whose partner usage is drafted into invoices by the worker. */
export class InvoiceRunRow extends Model<InferAttributes<InvoiceRunRow>, InferCreationAttributes<InvoiceRunRow>> {
  declare id: CreationOptional<string>;
  declare periodFrom: string;
  declare periodTo: string;
  declare state: CreationOptional<'queued' | 'running' | 'done' | 'failed'>;
  declare drafted: CreationOptional<number>;
  declare error: string | null;
  declare startedByPersonId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare finishedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    InvoiceRunRow.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        periodFrom: { type: DataTypes.DATEONLY, allowNull: false },
        periodTo: { type: DataTypes.DATEONLY, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'queued' },
        drafted: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        error: { type: DataTypes.TEXT, allowNull: true },
        startedByPersonId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
        finishedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'invoice_runs' },
    );
  }
}

/** The last invoice number given in a year (locked while the next is taken: no gaps). */
export class InvoiceNumberRow extends Model<InferAttributes<InvoiceNumberRow>, InferCreationAttributes<InvoiceNumberRow>> {
  declare year: number;
  declare last: number;

  static initModel(sequelize: Sequelize) {
    InvoiceNumberRow.init(
      { year: { type: DataTypes.INTEGER, primaryKey: true }, last: { type: DataTypes.INTEGER, allowNull: false } },
      { sequelize, tableName: 'invoice_numbers', timestamps: false },
    );
  }
}

export type InvoiceState = 'draft' | 'issued' | 'paid' | 'void';

/** A partner's invoice: a draft until issued; then its figures are fixed (a database trigger keeps them). */
export class InvoiceRow extends Model<InferAttributes<InvoiceRow>, InferCreationAttributes<InvoiceRow>> {
  declare id: CreationOptional<string>;
  declare institutionId: string;
  declare runId: string | null;
  declare number: string | null;
  declare state: CreationOptional<InvoiceState>;
  declare currency: string;
  declare periodFrom: string;
  declare periodTo: string;
  declare rateCard: Record<string, unknown>;
  declare lines: Record<string, unknown>[];
  declare subtotalMinor: number | string;
  declare discountMinor: number | string;
  declare taxMinor: number | string;
  declare totalMinor: number | string;
  declare issuedOn: string | null;
  declare dueOn: string | null;
  declare paidAt: Date | null;
  declare voidedAt: Date | null;
  declare voidReason: string | null;
  declare creditNoteNumber: string | null;
  declare paymentReference: string | null;
  declare paymentState: 'pending' | 'failed' | 'succeeded' | null;
  declare stripeInvoiceId: string | null;
  declare hostedPaymentUrl: string | null;
  declare pdfObjectKey: string | null;
  declare remindedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    InvoiceRow.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        institutionId: { type: DataTypes.UUID, allowNull: false },
        runId: { type: DataTypes.UUID, allowNull: true },
        number: { type: DataTypes.TEXT, allowNull: true },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
        currency: { type: DataTypes.CHAR(3), allowNull: false },
        periodFrom: { type: DataTypes.DATEONLY, allowNull: false },
        periodTo: { type: DataTypes.DATEONLY, allowNull: false },
        rateCard: { type: DataTypes.JSONB, allowNull: false },
        lines: { type: DataTypes.JSONB, allowNull: false },
        subtotalMinor: { type: DataTypes.BIGINT, allowNull: false },
        discountMinor: { type: DataTypes.BIGINT, allowNull: false },
        taxMinor: { type: DataTypes.BIGINT, allowNull: false },
        totalMinor: { type: DataTypes.BIGINT, allowNull: false },
        issuedOn: { type: DataTypes.DATEONLY, allowNull: true },
        dueOn: { type: DataTypes.DATEONLY, allowNull: true },
        paidAt: { type: DataTypes.DATE, allowNull: true },
        voidedAt: { type: DataTypes.DATE, allowNull: true },
        voidReason: { type: DataTypes.TEXT, allowNull: true },
        creditNoteNumber: { type: DataTypes.TEXT, allowNull: true },
        paymentReference: { type: DataTypes.TEXT, allowNull: true },
        paymentState: { type: DataTypes.TEXT, allowNull: true },
        stripeInvoiceId: { type: DataTypes.TEXT, allowNull: true },
        hostedPaymentUrl: { type: DataTypes.TEXT, allowNull: true },
        pdfObjectKey: { type: DataTypes.TEXT, allowNull: true },
        remindedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'invoices' },
    );
  }
}

/** A ledger entry billed on an invoice (once at most). */
export class InvoiceEntryRow extends Model<InferAttributes<InvoiceEntryRow>, InferCreationAttributes<InvoiceEntryRow>> {
  declare ledgerEntryId: number | string;
  declare invoiceId: string;

  static initModel(sequelize: Sequelize) {
    InvoiceEntryRow.init(
      { ledgerEntryId: { type: DataTypes.BIGINT, primaryKey: true }, invoiceId: { type: DataTypes.UUID, allowNull: false } },
      { sequelize, tableName: 'invoice_entries', timestamps: false },
    );
  }
}

/** A Stripe event processed (its id once). */
export class StripeEventRow extends Model<InferAttributes<StripeEventRow>, InferCreationAttributes<StripeEventRow>> {
  declare id: string;
  declare type: string;
  declare createdAt: Date;
  declare receivedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StripeEventRow.init(
      {
        id: { type: DataTypes.TEXT, primaryKey: true },
        type: { type: DataTypes.TEXT, allowNull: false },
        createdAt: { type: DataTypes.DATE, allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'stripe_events', timestamps: false },
    );
  }
}
