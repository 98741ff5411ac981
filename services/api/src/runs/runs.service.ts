import { UniqueConstraintError, type Transaction } from 'sequelize';
import {
  errors,
  formatCoreHours,
  fromMilli,
  judgeDebit,
  parseRunImport,
  runMilliCoreHours,
  toMilli,
  type ImportRow,
  type Run,
  type RunImportRequest,
  type RunImportResult,
  type RunInput,
  type RunListQuery,
} from '@localis/shared';
import type { Database } from '../db';
import type { RequestContext } from '../http/principal';
import { actsAsAdmin } from '../http/acts-as-admin';
import { auditService } from '../audit/audit.service';
import type { CampaignRecord } from '../campaigns/campaigns.repository';
import type { CampaignsService } from '../campaigns/campaigns.service';
import type { LedgerService } from '../ledger/ledger.service';
import { ledgerRepository } from '../ledger/ledger.repository';
import { roundsRepository } from '../rounds/rounds.repository';
import { runsRepository } from './runs.repository';
import { appendProvenance } from '../provenance/provenance.service';
import { runRecord } from '../provenance/provenance-records';

/** Each recorded run is an entry of the provenance log, written in the run's transaction. */
function provenanceOfRuns(ctx: RequestContext, c: CampaignRecord, runs: { id: string; input: RunInput; milli: number }[], tx: Transaction) {
  const p = ctx.principal;
  const recordedBy = p && p.via !== 'system' ? { personId: p.personId, name: p.name } : null;
  const at = new Date().toISOString();
  return appendProvenance(
    runs.map(({ id, input, milli }) => ({
      subjectId: id,
      record: runRecord({
        id,
        campaignId: c.id,
        campaignTitle: c.title,
        externalJobId: input.externalJobId,
        machine: input.machine,
        startedAt: new Date(input.startedAt).toISOString(),
        endedAt: new Date(input.endedAt).toISOString(),
        cores: input.cores,
        coreHours: fromMilli(milli),
        codeName: input.codeName,
        codeVersion: input.codeVersion,
        recordedBy,
        at,
      }),
    })),
    tx,
  );
}

/** A run's core-hours: as given, or cores x wall-clock. */
export const runMilli = (r: RunInput) => (r.coreHours !== undefined ? toMilli(r.coreHours) : runMilliCoreHours(r.cores, r.startedAt, r.endedAt));

const sourceOf = (ctx: RequestContext): Run['source'] => (ctx.principal?.via === 'token' ? 'api' : 'portal');

/** Runs: jobs on the machines, each debiting its campaign's grant in the same transaction. */
export function createRunsService(db: Database, campaigns: CampaignsService, ledger: LedgerService) {
  async function requireRecorder(ctx: RequestContext, c: CampaignRecord, tx?: Transaction): Promise<void> {
    const p = ctx.principal!;
    if (actsAsAdmin(p) || (await campaigns.isGroupMember(c, p.personId, tx))) return;
    throw errors.forbidden(`Runs of "${c.title}" are recorded by members of ${c.groupName} or the consortium office.`);
  }

  function requireMachine(c: CampaignRecord, machine: string, path: (string | number)[] = ['machine']) {
    if (machine !== c.machine) {
      throw errors.invalid(`"${c.title}" was granted core-hours on ${c.machine}; a run on ${machine} cannot be charged to it.`, [{ path, message: `runs of this campaign are on ${c.machine}` }]);
    }
  }

  async function insertRun(ctx: RequestContext, c: CampaignRecord, input: RunInput, source: Run['source'], tx: Transaction): Promise<string> {
    const milli = runMilli(input);
    if (milli <= 0) throw errors.invalid('The run is too short to charge: cores x wall-clock is under 0.001 core-hour (3.6 core-seconds).', [{ path: ['endedAt'], message: 'a run must come to at least 3.6 core-seconds' }]);
    let id: string;
    try {
      id = await runsRepository.create({ ...input, campaignId: c.id, milli, source, recordedByPersonId: ctx.principal?.via === 'system' ? null : ctx.principal!.personId }, tx);
    } catch (e) {
      if (e instanceof UniqueConstraintError) throw errors.conflict(`Job ${input.externalJobId} on ${input.machine} is recorded already; a job is charged once.`);
      throw e;
    }
    await ledger.debitIn(ctx, c, { id, externalJobId: input.externalJobId, milli }, tx);
    await provenanceOfRuns(ctx, c, [{ id, input, milli }], tx);
    return id;
  }

  /** Check every row of an import; nothing is written. */
  async function preview(c: CampaignRecord, request: RunImportRequest, tx?: Transaction): Promise<RunImportResult & { fileError: string | null; inputs: (RunInput | null)[] }> {
    const parsed = parseRunImport(request, c.machine);
    const recorded = await runsRepository.recordedJobIds(c.machine, parsed.rows.flatMap((r) => (r.input ? [r.input.externalJobId] : [])), tx);
    const seen = new Map<string, number>();
    let totalMilli = 0;
    const rows: ImportRow[] = parsed.rows.map((r) => {
      const errorsOfRow = [...r.errors];
      if (r.input && r.input.machine !== c.machine) errorsOfRow.push(`machine ${r.input.machine}: this campaign's runs are on ${c.machine}`);
      const jobId = r.input?.externalJobId ?? r.raw[parsed.columns.find((col) => parsed.mapping[col] === 'externalJobId') ?? ''] ?? null;
      let duplicate: ImportRow['duplicate'] = null;
      if (jobId) {
        if (seen.has(jobId)) duplicate = 'in-file';
        else if (recorded.has(jobId)) duplicate = 'recorded';
        if (!seen.has(jobId)) seen.set(jobId, r.line);
      }
      if (duplicate === 'in-file') errorsOfRow.push(`job ${jobId} appears already on line ${seen.get(jobId!)}`);
      if (duplicate === 'recorded') errorsOfRow.push(`job ${jobId} is recorded already on ${c.machine}`);
      const milli = r.input ? runMilli(r.input) : null;
      if (milli !== null && milli <= 0) errorsOfRow.push('the run is shorter than 0.001 core-hour (3.6 core-seconds), too short to charge');
      if (milli !== null && !errorsOfRow.length) totalMilli += milli;
      return {
        line: r.line,
        externalJobId: jobId || null,
        startedAt: r.input?.startedAt ?? null,
        endedAt: r.input?.endedAt ?? null,
        cores: r.input?.cores ?? null,
        coreHours: milli === null ? null : fromMilli(milli),
        errors: errorsOfRow,
        duplicate,
      };
    });
    const balances = await ledgerRepository.balances(c.id, tx);
    const round = await roundsRepository.find(c.roundId, tx);
    const verdict = judgeDebit(balances, totalMilli, round?.overdraftPercent ?? 0);
    const granted = c.state === 'granted' || c.state === 'partly-granted';
    return {
      dryRun: true,
      committed: false,
      columns: parsed.columns,
      mapping: parsed.mapping,
      unknownColumns: parsed.unknownColumns,
      missingFields: parsed.missingFields,
      rows,
      summary: {
        rows: rows.length,
        valid: rows.filter((r) => !r.errors.length).length,
        withErrors: rows.filter((r) => r.errors.length).length,
        duplicates: rows.filter((r) => r.duplicate).length,
        coreHours: fromMilli(totalMilli),
      },
      ledger: { remaining: fromMilli(balances.remaining), after: fromMilli(verdict.remainingAfter), allowed: granted && verdict.allowed, overdraft: verdict.allowed && verdict.overdraft },
      runIds: [],
      fileError: parsed.fileError,
      inputs: parsed.rows.map((r) => r.input),
    };
  }

  /** Every problem of the file and its rows, as error details (the ledger is judged apart). */
  function problemsOf(result: RunImportResult & { fileError: string | null }) {
    const details: { path: (string | number)[]; message: string }[] = [];
    if (result.fileError) details.push({ path: ['csv'], message: result.fileError });
    for (const col of result.unknownColumns) details.push({ path: ['mapping', col], message: `column "${col}" is not known: map it to a run field or to "ignore"` });
    for (const f of result.missingFields) details.push({ path: ['mapping'], message: `no column gives ${f}` });
    for (const r of result.rows) for (const m of r.errors) details.push({ path: ['csv', r.line], message: `line ${r.line}: ${m}` });
    return details;
  }

  return {
    async list(ctx: RequestContext, campaignId: string, q: RunListQuery) {
      await campaigns.findVisible(ctx, campaignId);
      return runsRepository.list(campaignId, q);
    },

    create(ctx: RequestContext, campaignId: string, input: RunInput, source: Run['source'] = sourceOf(ctx)): Promise<Run> {
      return db.transaction(async (tx) => {
        // The lock queues every charge to this campaign: balances are read and written one at a time.
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        await requireRecorder(ctx, c, tx);
        requireMachine(c, input.machine);
        const id = await insertRun(ctx, c, input, source, tx);
        await auditService.record(ctx, 'run.recorded', { type: 'campaign', id: c.id }, { runId: id, externalJobId: input.externalJobId, machine: input.machine }, tx);
        return (await runsRepository.find(id, tx))!;
      });
    },

    async importRuns(ctx: RequestContext, campaignId: string, request: RunImportRequest, dryRun: boolean): Promise<RunImportResult> {
      if (dryRun) {
        const c = await campaigns.findVisible(ctx, campaignId);
        await requireRecorder(ctx, c);
        const { fileError: _f, inputs: _i, ...result } = await preview(c, request);
        return result;
      }
      return db.transaction(async (tx) => {
        const c = await campaigns.findVisible(ctx, campaignId, tx, true);
        await requireRecorder(ctx, c, tx);
        // Checked again under the lock: what was previewed may have changed since.
        const result = await preview(c, request, tx);
        const problems = problemsOf(result);
        if (problems.length) throw errors.invalid(`The import was not recorded: ${problems.length} problem${problems.length > 1 ? 's' : ''} to fix first. Nothing was written.`, problems.slice(0, 200));
        // Rows that are all fine but do not fit: the same 409 as a single run that does not fit.
        if (!result.ledger.allowed) {
          throw errors.conflict(
            c.state === 'granted' || c.state === 'partly-granted'
              ? `The import was not recorded: the runs need ${formatCoreHours(toMilli(result.summary.coreHours))} core-hours and "${c.title}" has ${formatCoreHours(toMilli(result.ledger.remaining))} left. Nothing was written.`
              : `The import was not recorded: "${c.title}" is not granted; runs are charged only to granted campaigns.`,
          );
        }
        // No problems: every row parsed to a run.
        const inputs = result.inputs as RunInput[];
        const recordedBy = ctx.principal?.via === 'system' ? null : ctx.principal!.personId;
        let runIds: string[];
        try {
          runIds = await runsRepository.createMany(inputs.map((input) => ({ ...input, campaignId: c.id, milli: runMilli(input), source: 'import', recordedByPersonId: recordedBy })), tx);
        } catch (e) {
          if (e instanceof UniqueConstraintError) throw errors.conflict('One of the jobs was recorded by someone else meanwhile; preview the file again. Nothing was written.');
          throw e;
        }
        await ledger.debitManyIn(ctx, c, runIds.map((id, i) => ({ id, milli: runMilli(inputs[i]) })), tx);
        await provenanceOfRuns(ctx, c, runIds.map((id, i) => ({ id, input: inputs[i], milli: runMilli(inputs[i]) })), tx);
        await auditService.record(ctx, 'run.imported', { type: 'campaign', id: c.id }, { runs: runIds.length, coreHours: result.summary.coreHours }, tx);
        const { fileError: _f, inputs: _i, ...rest } = result;
        return { ...rest, dryRun: false, committed: true, runIds };
      });
    },
  };
}
export type RunsService = ReturnType<typeof createRunsService>;
