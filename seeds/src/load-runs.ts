import type { Services } from '@localis/api/services';
import { Campaign, LedgerEntry, Run } from '@localis/api/db';
import { RunInput, type ImportMapping } from '@localis/shared';
import { RUN_PLANS, type ScenarioRun } from './runs-scenario';
import { adminContext, personContext, scenarioPerson } from './seed-context';

export interface RunCounts {
  runs: number;
  refunds: number;
  adjustments: number;
}

const isoSeconds = (ms: number) => new Date(ms).toISOString().slice(0, 19) + 'Z';

/**
 * When a demo run started and ended: days before the load at the given hour, lasting what its
 * share of the grant takes on its cores (whole minutes, as schedulers report them).
 */
export function runTimes(run: ScenarioRun, grantCoreHours: number, now: Date): { startedAt: string; endedAt: string } {
  const start = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() - run.daysAgo) + Math.round(run.startHourUtc * 60) * 60_000;
  const minutes = Math.max(1, Math.round(((run.shareOfGrant * grantCoreHours) / run.cores) * 60));
  return { startedAt: isoSeconds(start), endedAt: isoSeconds(start + minutes * 60_000) };
}

const IMPORT_COLUMNS = ['JobID', 'JobName', 'Start', 'End', 'AllocCPUS', 'Comment', 'L', 'W', 'E', 'Seed'] as const;
const IMPORT_MAPPING: ImportMapping = {
  JobID: 'externalJobId', JobName: 'codeName', Start: 'startedAt', End: 'endedAt', AllocCPUS: 'cores',
  Comment: 'codeVersion', L: 'sizes', W: 'disorder', E: 'energies', Seed: 'seeds',
};

/** The jobs as a scheduler's accounting export would list them (times in UTC, lists space-separated). */
export function accountingCsv(runs: ScenarioRun[], grantCoreHours: number, now: Date): string {
  const lines = runs.map((r) => {
    const { startedAt, endedAt } = runTimes(r, grantCoreHours, now);
    const p = r.parameters;
    return [r.externalJobId, r.codeName, startedAt.slice(0, 19), endedAt.slice(0, 19), r.cores, r.codeVersion, p.sizes.join(' '), p.disorder.join(' '), p.energies.join(' '), p.seeds.join(' ')].join(',');
  });
  return [IMPORT_COLUMNS.join(','), ...lines].join('\n') + '\n';
}

/**
 * Runs, refunds and adjustments of the granted demo campaigns, in the order they happened,
 * through the runs and ledger services (so every debit, usage alert and audit entry applies).
 * Runs are looked up by their job id on the machine, refunds by their run, adjustments by their
 * reason: a second load changes nothing and a load that stopped half-way picks up where it was.
 */
export async function loadRuns(services: Services, report: RunCounts, now = new Date()): Promise<void> {
  const admin = adminContext();
  for (const plan of RUN_PLANS) {
    const campaign = await Campaign.findByPk(plan.campaignId);
    if (!campaign) throw new Error(`the demo runs name campaign ${plan.campaignId}, which was not loaded`);
    const grantEntry = await LedgerEntry.findOne({ where: { campaignId: campaign.id, kind: 'grant' }, order: [['id', 'ASC']] });
    if (!grantEntry) {
      // A database loaded before the ledger existed holds the decision but no grant to charge.
      console.warn(`demo scenario: "${campaign.title}" has no grant in its ledger (decided before the ledger existed); its demo runs are left out. Start from an empty database to see them.`);
      continue;
    }
    // The grant as decided, not as adjusted later: the runs' wall-clock stays the same at every load.
    const grant = Number(grantEntry.milli) / 1000;
    const recorded = async (externalJobId: string) => !!(await Run.findOne({ where: { machine: campaign.machine, externalJobId }, attributes: ['id'] }));

    for (const step of plan.steps) {
      if (step.kind === 'run') {
        if (await recorded(step.run.externalJobId)) continue;
        const input = RunInput.parse({ ...toRunInput(step.run, grant, now), machine: campaign.machine });
        await services.runs.create(personContext(scenarioPerson(step.by)), campaign.id, input, step.via);
        report.runs++;
      } else if (step.kind === 'import') {
        // One import is one transaction, so its jobs are either all recorded or none.
        const missing: ScenarioRun[] = [];
        for (const r of step.runs) if (!(await recorded(r.externalJobId))) missing.push(r);
        if (!missing.length) continue;
        const result = await services.runs.importRuns(personContext(scenarioPerson(step.by)), campaign.id, { csv: accountingCsv(missing, grant, now), mapping: IMPORT_MAPPING }, false);
        report.runs += result.runIds.length;
      } else if (step.kind === 'refund') {
        const run = await Run.findOne({ where: { campaignId: campaign.id, externalJobId: step.externalJobId } });
        if (!run) throw new Error(`the demo refund names job ${step.externalJobId}, which is not among the runs of "${campaign.title}"`);
        if (await LedgerEntry.findOne({ where: { runId: run.id, kind: 'refund' }, attributes: ['id'] })) continue;
        await services.ledger.refund(admin, campaign.id, { runId: run.id, reason: step.reason });
        report.refunds++;
      } else {
        if (await LedgerEntry.findOne({ where: { campaignId: campaign.id, kind: 'adjustment', reason: step.reason }, attributes: ['id'] })) continue;
        await services.ledger.adjust(admin, campaign.id, { coreHours: step.coreHours, reason: step.reason });
        report.adjustments++;
      }
    }
  }
}

function toRunInput(run: ScenarioRun, grantCoreHours: number, now: Date) {
  return {
    externalJobId: run.externalJobId,
    ...runTimes(run, grantCoreHours, now),
    cores: run.cores,
    codeName: run.codeName,
    codeVersion: run.codeVersion,
    parameters: run.parameters,
  };
}
