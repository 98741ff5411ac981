import type { Transaction } from 'sequelize';
import { DECIDED_STATES, loadSettings, OPTIONAL_MAIL_KINDS, type NotificationKind } from '@localis/shared';
import { enqueueMail } from '../outbox/mail-outbox';
import { eventFactsRepository, type CampaignFacts, type Recipient } from './event-facts.repository';
import { notificationContent, renderMail, type NotificationData } from './mail-templates';
import { notificationsRepository } from './notifications.repository';

export type NotificationEvent =
  | { kind: 'proposal-submitted'; campaignId: string }
  | { kind: 'review-assigned'; assignmentId: string }
  | { kind: 'decision'; campaignId: string }
  | { kind: 'usage-threshold'; campaignId: string; threshold: 75 | 90 | 100 }
  | { kind: 'round-closing'; roundId: string };

/** One person to tell, what to tell them, and which occurrence of the event it is. */
interface Delivery {
  recipient: Recipient;
  data: NotificationData;
  /** Names the occurrence (a campaign, a campaign and threshold, a round and its closing date). */
  occurrence: string;
}

/** The in-app key, unique per person: the same occurrence never makes a second row (or mail). */
const IN_APP_KEY_PREFIX: Record<NotificationKind, string> = {
  'proposal-submitted': 'proposal-submitted',
  'review-assigned': 'review-assigned',
  decision: 'decision',
  'usage-threshold': 'usage',
  'round-closing': 'round-closing',
};

let publicUrlFromEnv: string | undefined;
/** Callers inside the api pass nothing; the process's settings say where people reach Localis. */
function defaultPublicUrl(): string {
  return (publicUrlFromEnv ??= loadSettings(process.env).PUBLIC_URL);
}

const isOptional = (kind: NotificationKind) => (OPTIONAL_MAIL_KINDS as readonly string[]).includes(kind);

/** Whether this person gets the mail: mandatory kinds always, optional ones unless turned off. */
function wantsMail(recipient: Pick<Recipient, 'mailPreferences'>, kind: NotificationKind): boolean {
  return !isOptional(kind) || recipient.mailPreferences[kind] !== false;
}

async function requireCampaign(id: string, tx: Transaction): Promise<CampaignFacts> {
  const c = await eventFactsRepository.campaign(id, tx);
  // A programming error: the caller reports a change to a campaign that is not there.
  if (!c) throw new Error(`notify: campaign ${id} does not exist`);
  return c;
}

const byId = (people: Recipient[]) => new Map(people.map((p) => [p.id, p]));

async function deliveriesOf(event: NotificationEvent, tx: Transaction): Promise<Delivery[]> {
  switch (event.kind) {
    case 'proposal-submitted': {
      const c = await requireCampaign(event.campaignId, tx);
      // One connection per transaction: its queries run one after another anyway.
      const pis = await eventFactsRepository.activePeople([c.piPersonId], tx);
      const admins = await eventFactsRepository.activeAdmins(tx);
      // The PI who is also an admin reads the PI's words, once.
      const audience = new Map<string, { recipient: Recipient; audience: 'pi' | 'office' }>();
      for (const a of admins) audience.set(a.id, { recipient: a, audience: 'office' });
      for (const p of pis) audience.set(p.id, { recipient: p, audience: 'pi' });
      return [...audience.values()].map(({ recipient, audience: who }) => ({
        recipient,
        occurrence: c.id,
        data: {
          kind: 'proposal-submitted', campaignId: c.id, title: c.title, groupName: c.groupName, roundName: c.roundName,
          machine: c.machine, requestedCoreHours: c.requestedCoreHours, audience: who,
        },
      }));
    }

    case 'review-assigned': {
      const a = await eventFactsRepository.assignment(event.assignmentId, tx);
      if (!a) throw new Error(`notify: review assignment ${event.assignmentId} does not exist`);
      const c = await requireCampaign(a.campaignId, tx);
      const reviewers = await eventFactsRepository.activePeople([a.reviewerPersonId], tx);
      return reviewers.map((recipient) => ({
        recipient,
        occurrence: event.assignmentId,
        data: {
          kind: 'review-assigned', campaignId: c.id, title: c.title, groupName: c.groupName, roundName: c.roundName,
          machine: c.machine, requestedCoreHours: c.requestedCoreHours,
        },
      }));
    }

    case 'decision': {
      const c = await requireCampaign(event.campaignId, tx);
      if (!DECIDED_STATES.includes(c.state)) throw new Error(`notify: campaign ${c.id} is ${c.state}, not decided`);
      const message = await eventFactsRepository.noteOfLatestMove(c.id, c.state, tx);
      const people = await eventFactsRepository.activePeople([c.ownerPersonId, c.piPersonId], tx);
      return people.map((recipient) => ({
        recipient,
        occurrence: c.id,
        data: {
          kind: 'decision', campaignId: c.id, title: c.title, outcome: c.state as 'granted' | 'partly-granted' | 'declined',
          requestedCoreHours: c.requestedCoreHours, grantedCoreHours: c.grantedCoreHours ?? 0, machine: c.machine,
          roundName: c.roundName, allocationEndsAt: c.allocationEndsAt, message,
        },
      }));
    }

    case 'usage-threshold': {
      const c = await requireCampaign(event.campaignId, tx);
      const usage = await eventFactsRepository.usage(c.id, tx);
      const people = await eventFactsRepository.activePeople([c.ownerPersonId, c.piPersonId], tx);
      return people.map((recipient) => ({
        recipient,
        occurrence: `${c.id}:${event.threshold}`,
        data: {
          kind: 'usage-threshold', campaignId: c.id, title: c.title, threshold: event.threshold, ...usage,
          overdraftPercent: c.overdraftPercent, allocationEndsAt: c.allocationEndsAt,
        },
      }));
    }

    case 'round-closing': {
      const round = await eventFactsRepository.round(event.roundId, tx);
      if (!round) throw new Error(`notify: round ${event.roundId} does not exist`);
      const pis = await eventFactsRepository.activeGroupPis(tx);
      const drafts = await eventFactsRepository.draftsByOwner(round.id, tx);
      const piIds = new Set(pis.map((p) => p.id));
      const owners = await eventFactsRepository.activePeople([...drafts.keys()].filter((id) => !piIds.has(id)), tx);
      const people = byId([...pis, ...owners]);
      // A moved closing date is a new occurrence: the key carries the date.
      const occurrence = `${round.id}:${round.closesAt.toISOString()}`;
      return [...people.values()].map((recipient) => ({
        recipient,
        occurrence,
        data: {
          kind: 'round-closing', roundId: round.id, roundName: round.name, closesAt: round.closesAt,
          isPi: piIds.has(recipient.id), drafts: drafts.get(recipient.id) ?? [],
        },
      }));
    }
  }
}

/**
 * Tell the people concerned about an event: an in-app notification each and, unless they turned
 * that optional mail off, an e-mail through the outbox. Call it inside the transaction of the
 * change, so the notice exists exactly when the change does. Repeating an event changes nothing.
 */
export async function notify(event: NotificationEvent, tx: Transaction, publicUrl: string = defaultPublicUrl()): Promise<void> {
  const deliveries = await deliveriesOf(event, tx);
  const rows = deliveries.map(({ recipient, data, occurrence }) => {
    const content = notificationContent(data);
    return {
      personId: recipient.id,
      kind: data.kind,
      title: content.title,
      body: content.quote ? `${content.summary}\n\n${content.quote.label}: ${content.quote.text}` : content.summary,
      link: content.action.path,
      dedupeKey: `${IN_APP_KEY_PREFIX[data.kind]}:${occurrence}`,
    };
  });
  const fresh = await notificationsRepository.insertNew(rows, tx);
  for (const { recipient, data, occurrence } of deliveries) {
    if (!fresh.has(recipient.id) || !wantsMail(recipient, data.kind)) continue;
    // Stable, so a retried mail job never sends it twice.
    const dedupeKey = `${data.kind}:${occurrence}:${recipient.id}`;
    await enqueueMail({ to: [recipient.email], ...renderMail(data, recipient, publicUrl), dedupeKey }, tx);
  }
}
