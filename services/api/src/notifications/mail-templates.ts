import { NOTIFICATION_KIND_LABELS, OPTIONAL_MAIL_KINDS, type NotificationKind } from '@localis/shared';

/** What each kind of notification says, from the facts `notify` loads. Core-hours are plain numbers. */
export interface TemplateData {
  'proposal-submitted': {
    campaignId: string;
    title: string;
    groupName: string;
    roundName: string;
    machine: string;
    requestedCoreHours: number;
    /** The group's PI reads a confirmation; the office reads a new item of work. */
    audience: 'pi' | 'office';
  };
  'review-assigned': {
    campaignId: string;
    title: string;
    groupName: string;
    roundName: string;
    machine: string;
    requestedCoreHours: number;
  };
  decision: {
    campaignId: string;
    title: string;
    outcome: 'granted' | 'partly-granted' | 'declined';
    requestedCoreHours: number;
    grantedCoreHours: number;
    machine: string;
    roundName: string;
    allocationEndsAt: Date;
    /** The office's words to the proposers, shown as written. */
    message: string | null;
  };
  'usage-threshold': {
    campaignId: string;
    title: string;
    threshold: 75 | 90 | 100;
    grantedCoreHours: number;
    usedCoreHours: number;
    overdraftPercent: number;
    allocationEndsAt: Date;
  };
  'round-closing': {
    roundId: string;
    roundName: string;
    closesAt: Date;
    /** The reader leads a group (and may submit); otherwise they only own drafts. */
    isPi: boolean;
    /** The reader's own drafts in the round. */
    drafts: { id: string; title: string }[];
  };
}

export type NotificationData = { [K in NotificationKind]: { kind: K } & TemplateData[K] }[NotificationKind];

/** The words of one notification: the in-app row is title, summary and action path; the mail adds the rest. */
export interface NotificationContent {
  kind: NotificationKind;
  title: string;
  summary: string;
  /** Label and value lines under the summary. */
  facts: [string, string][];
  /** Longer text of a person, quoted verbatim (the decision message). */
  quote?: { label: string; text: string };
  /** A portal path and the words of the button leading there. */
  action: { label: string; path: string };
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

const numberFormat = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 3 });
const coreHours = (n: number) => `${numberFormat.format(n)} core-hours`;
const dateTimeFormat = new Intl.DateTimeFormat('en-GB', {
  weekday: 'short', day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: 'UTC',
});
/** Mail readers are anywhere; the portal shows local times, a mail states UTC plainly. */
const utc = (d: Date) => `${dateTimeFormat.format(d)} UTC`;
const quoted = (s: string) => `“${s}”`;

const TEMPLATES: { [K in NotificationKind]: (d: TemplateData[K]) => NotificationContent } = {
  'proposal-submitted': (d) => ({
    kind: 'proposal-submitted',
    title: d.audience === 'pi' ? `Submitted: ${d.title}` : `New proposal: ${d.title}`,
    summary:
      d.audience === 'pi'
        ? `${quoted(d.title)} of ${d.groupName} is submitted to ${d.roundName}. It is read-only from now on; the office assigns reviewers next.`
        : `${d.groupName} submitted ${quoted(d.title)} to ${d.roundName}. It waits for reviewers to be assigned.`,
    facts: [
      ['Group', d.groupName],
      ['Round', d.roundName],
      ['Machine', d.machine],
      ['Requested', coreHours(d.requestedCoreHours)],
    ],
    action: { label: 'Open the proposal', path: `/campaigns/${d.campaignId}` },
  }),

  'review-assigned': (d) => ({
    kind: 'review-assigned',
    title: `Please review: ${d.title}`,
    summary: `The office asks you to review ${quoted(d.title)} of ${d.groupName} (${d.roundName}). If you have a conflict of interest, declare it in your review queue instead.`,
    facts: [
      ['Group', d.groupName],
      ['Round', d.roundName],
      ['Machine', d.machine],
      ['Requested', coreHours(d.requestedCoreHours)],
    ],
    action: { label: 'Open your review queue', path: '/committee' },
  }),

  decision: (d) => {
    const outcome = {
      granted: {
        title: `Granted: ${d.title}`,
        summary: `The office granted ${coreHours(d.grantedCoreHours)} on ${d.machine} to ${quoted(d.title)}; they can be used until ${utc(d.allocationEndsAt)}.`,
      },
      'partly-granted': {
        title: `Partly granted: ${d.title}`,
        summary: `The office granted ${coreHours(d.grantedCoreHours)} of the ${coreHours(d.requestedCoreHours)} requested on ${d.machine} to ${quoted(d.title)}; they can be used until ${utc(d.allocationEndsAt)}.`,
      },
      declined: {
        title: `Declined: ${d.title}`,
        summary: `The office declined ${quoted(d.title)}. The reviewers' feedback is on the proposal's page.`,
      },
    }[d.outcome];
    return {
      kind: 'decision',
      ...outcome,
      facts: [
        ['Round', d.roundName],
        ['Requested', coreHours(d.requestedCoreHours)],
        ['Granted', coreHours(d.grantedCoreHours)],
      ],
      ...(d.message ? { quote: { label: 'Message from the office', text: d.message } } : {}),
      action: { label: 'Open the campaign', path: `/campaigns/${d.campaignId}` },
    };
  },

  'usage-threshold': (d) => {
    const percent = d.grantedCoreHours > 0 ? Math.floor((d.usedCoreHours / d.grantedCoreHours) * 100) : 100;
    const used = `${quoted(d.title)} has used ${coreHours(d.usedCoreHours)} of its ${coreHours(d.grantedCoreHours)} (${percent} %).`;
    const next =
      d.threshold < 100
        ? ` The grant can be used until ${utc(d.allocationEndsAt)}.`
        : d.overdraftPercent > 0
          ? ` Runs may take it up to ${d.overdraftPercent} % beyond the grant; after that they are refused.`
          : ' Further runs are refused; the office can adjust the grant, or the PI can transfer core-hours from another of the group’s campaigns.';
    return {
      kind: 'usage-threshold',
      title: d.threshold === 100 ? `Grant used up: ${d.title}` : `${d.threshold} % of the grant used: ${d.title}`,
      summary: used + next,
      facts: [
        ['Granted', coreHours(d.grantedCoreHours)],
        ['Used', coreHours(d.usedCoreHours)],
        ['Remaining', coreHours(Math.round((d.grantedCoreHours - d.usedCoreHours) * 1000) / 1000)],
        ['Usable until', utc(d.allocationEndsAt)],
      ],
      action: { label: 'Open the ledger', path: `/campaigns/${d.campaignId}/ledger` },
    };
  },

  'round-closing': (d) => {
    const drafts = d.drafts.map((c) => quoted(c.title)).join(', ');
    const own =
      d.drafts.length === 0
        ? ''
        : ` Your draft${d.drafts.length > 1 ? 's' : ''} in this round: ${drafts}.${d.isPi ? '' : ' Only the group’s PI can submit a proposal.'}`;
    return {
      kind: 'round-closing',
      title: `${d.roundName} closes on ${utc(d.closesAt)}`,
      summary: `The allocation round ${d.roundName} takes proposals until ${utc(d.closesAt)}; drafts not submitted by then stay drafts.${own}`,
      facts: [
        ['Round', d.roundName],
        ['Closes', utc(d.closesAt)],
      ],
      action:
        d.drafts.length === 1
          ? { label: 'Open your draft', path: `/campaigns/${d.drafts[0].id}` }
          : d.drafts.length > 1
            ? { label: 'Open your campaigns', path: '/campaigns' }
            : { label: 'Start a proposal', path: '/campaigns/new' },
    };
  },
};

/** The words of a notification, for the in-app row and the mail alike. */
export function notificationContent(data: NotificationData): NotificationContent {
  return (TEMPLATES[data.kind] as (d: NotificationData) => NotificationContent)(data);
}

const isOptional = (kind: NotificationKind) => (OPTIONAL_MAIL_KINDS as readonly string[]).includes(kind);

const ALWAYS_SENT_BECAUSE: Partial<Record<NotificationKind, string>> = {
  'review-assigned': 'it asks for your review',
  decision: 'it reports the decision on a proposal of yours',
};

function footerText(kind: NotificationKind, publicUrl: string): string {
  if (isOptional(kind)) {
    return `You get this mail because “${NOTIFICATION_KIND_LABELS[kind]}” is on in your mail settings. Turn it off on your profile page: ${publicUrl}/profile`;
  }
  return `This mail always goes out: ${ALWAYS_SENT_BECAUSE[kind] ?? 'it needs your attention'}. You find it under notifications in Localis too.`;
}

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
/** Every piece of text that enters the HTML goes through here: titles and messages are people's words. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/** Mail readers ignore style sheets; everything is inline and table-based. */
const FONT = "Lato, 'Helvetica Neue', Helvetica, Arial, sans-serif";
const INK = '#292524';
const MUTED = '#57534e';
const RULE = '#e7e5e4';
const TEAL = '#1a5f59';
const BUTTON = '#1f766e';

function layoutHtml(c: NotificationContent, recipientName: string, url: string, publicUrl: string): string {
  const facts = c.facts
    .map(
      ([label, value]) =>
        `<tr><td style="padding:4px 16px 4px 0;color:${MUTED};white-space:nowrap;vertical-align:top;">${escapeHtml(label)}</td>` +
        `<td style="padding:4px 0;color:${INK};">${escapeHtml(value)}</td></tr>`,
    )
    .join('');
  const quote = c.quote
    ? `<p style="margin:20px 0 6px;font-weight:700;">${escapeHtml(c.quote.label)}</p>` +
      `<blockquote style="margin:0;padding:8px 14px;border-left:4px solid ${BUTTON};background:#f0f9f8;color:${INK};">${escapeHtml(c.quote.text).replace(/\r?\n/g, '<br>')}</blockquote>`
    : '';
  const footer = isOptional(c.kind)
    ? `You get this mail because “${escapeHtml(NOTIFICATION_KIND_LABELS[c.kind])}” is on in your mail settings. ` +
      `<a href="${escapeHtml(`${publicUrl}/profile`)}" style="color:${TEAL};">Turn it off on your profile page</a>.`
    : escapeHtml(footerText(c.kind, publicUrl));
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(c.title)}</title></head>
<body style="margin:0;padding:0;background:#f5f5f4;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:#f5f5f4;font-family:${FONT};font-size:16px;line-height:1.5;color:${INK};">
<tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:600px;background:#ffffff;border:1px solid ${RULE};border-radius:8px;">
<tr><td style="background:${TEAL};color:#ffffff;padding:14px 24px;font-size:20px;font-weight:700;letter-spacing:0.02em;border-radius:8px 8px 0 0;">Localis</td></tr>
<tr><td style="padding:24px;">
<h1 style="margin:0 0 16px;font-size:20px;line-height:1.3;font-weight:700;color:${INK};">${escapeHtml(c.title)}</h1>
<p style="margin:0 0 12px;">Hello ${escapeHtml(recipientName)},</p>
<p style="margin:0 0 16px;">${escapeHtml(c.summary)}</p>
<table role="presentation" cellpadding="0" cellspacing="0" style="font-size:15px;">${facts}</table>
${quote}
<p style="margin:24px 0 8px;"><a href="${escapeHtml(url)}" style="display:inline-block;background:${BUTTON};color:#ffffff;text-decoration:none;font-weight:700;padding:10px 18px;border-radius:6px;">${escapeHtml(c.action.label)}</a></p>
<p style="margin:0;font-size:13px;color:${MUTED};">Or open <a href="${escapeHtml(url)}" style="color:${TEAL};">${escapeHtml(url)}</a></p>
</td></tr>
<tr><td style="padding:16px 24px;border-top:1px solid ${RULE};font-size:13px;line-height:1.45;color:${MUTED};">${footer}<br>Localis, for the consortium office.</td></tr>
</table>
</td></tr>
</table>
</body>
</html>`;
}

function layoutText(c: NotificationContent, recipientName: string, url: string, publicUrl: string): string {
  const width = Math.max(...c.facts.map(([label]) => label.length));
  const lines = [
    `Hello ${recipientName},`,
    '',
    c.summary,
    '',
    ...c.facts.map(([label, value]) => `${`${label}:`.padEnd(width + 2)}${value}`),
  ];
  if (c.quote) lines.push('', `${c.quote.label}:`, ...c.quote.text.split(/\r?\n/).map((l) => `> ${l}`));
  lines.push('', `${c.action.label}: ${url}`, '', '-- ', 'Localis, for the consortium office', footerText(c.kind, publicUrl));
  return lines.join('\n');
}

/**
 * The mail of one notification to one person. `publicUrl` is where people reach Localis; mails
 * carry absolute links, the in-app rows portal paths.
 */
export function renderMail(data: NotificationData, recipient: { name: string }, publicUrl: string): RenderedMail {
  const base = publicUrl.replace(/\/+$/, '');
  const content = notificationContent(data);
  const url = `${base}${content.action.path}`;
  return {
    // A subject is one header line, whatever a title contains.
    subject: content.title.replace(/\s+/g, ' ').trim().slice(0, 300),
    text: layoutText(content, recipient.name, url, base),
    html: layoutHtml(content, recipient.name, url, base),
  };
}
