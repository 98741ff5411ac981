import { describe, expect, it } from 'vitest';
import { NOTIFICATION_KINDS, type NotificationKind } from '@localis/shared';
import { escapeHtml, notificationContent, renderMail, type NotificationData } from './mail-templates';

const PUBLIC_URL = 'https://localis.example.org/';
const CAMPAIGN = '6f1c2a4e-0000-4000-8000-000000000001';
const ROUND = '6f1c2a4e-0000-4000-8000-000000000002';
const reader = { name: 'Ada Brennmoor' };

/** One example per kind; the table is keyed by kind, so a new kind fails the typecheck until it has one. */
const EXAMPLES: { [K in NotificationKind]: Extract<NotificationData, { kind: K }> } = {
  'proposal-submitted': {
    kind: 'proposal-submitted', campaignId: CAMPAIGN, title: 'Critical exponent of the 3D Anderson model', groupName: 'Lattice Disorder Group',
    roundName: 'Spring 2027', machine: 'kestrel-hpc', requestedCoreHours: 1_250_000, audience: 'office',
  },
  'review-assigned': {
    kind: 'review-assigned', campaignId: CAMPAIGN, title: 'Critical exponent of the 3D Anderson model', groupName: 'Lattice Disorder Group',
    roundName: 'Spring 2027', machine: 'kestrel-hpc', requestedCoreHours: 1_250_000,
  },
  decision: {
    kind: 'decision', campaignId: CAMPAIGN, title: 'Critical exponent of the 3D Anderson model', outcome: 'partly-granted',
    requestedCoreHours: 1_250_000, grantedCoreHours: 800_000, machine: 'kestrel-hpc', roundName: 'Spring 2027',
    allocationEndsAt: new Date('2028-03-31T23:59:00Z'), message: 'Strong case.\nThe largest size is not funded.',
  },
  'usage-threshold': {
    kind: 'usage-threshold', campaignId: CAMPAIGN, title: 'Critical exponent of the 3D Anderson model', threshold: 90,
    grantedCoreHours: 1000, usedCoreHours: 912.5, overdraftPercent: 0, allocationEndsAt: new Date('2028-03-31T23:59:00Z'),
  },
  'round-closing': {
    kind: 'round-closing', roundId: ROUND, roundName: 'Spring 2027', closesAt: new Date('2027-03-31T23:59:00Z'), isPi: false,
    drafts: [{ id: CAMPAIGN, title: 'Critical exponent of the 3D Anderson model' }],
  },
};

describe('mail templates', () => {
  describe('every kind', () => {
    it.each(NOTIFICATION_KINDS)('should give %s a subject, a text and an HTML part with an absolute link', (kind) => {
      const mail = renderMail(EXAMPLES[kind], reader, PUBLIC_URL);
      const content = notificationContent(EXAMPLES[kind]);
      expect(mail.subject).toBe(content.title);
      expect(mail.text).toContain('Hello Ada Brennmoor,');
      expect(mail.text).toContain(`https://localis.example.org${content.action.path}`);
      expect(mail.html).toContain(`href="https://localis.example.org${content.action.path}"`);
      expect(mail.html).toMatch(/^<!doctype html>/);
      expect(mail.html).toContain('Localis');
      expect(mail.html).toContain('font-family:Lato');
      expect(content.action.path.startsWith('/')).toBe(true);
    });

    it.each([
      ['proposal-submitted', `/campaigns/${CAMPAIGN}`],
      ['review-assigned', '/committee'],
      ['decision', `/campaigns/${CAMPAIGN}`],
      ['usage-threshold', `/campaigns/${CAMPAIGN}/ledger`],
      ['round-closing', `/campaigns/${CAMPAIGN}`],
    ] as const)('should link %s to %s in the portal', (kind, path) => {
      expect(notificationContent(EXAMPLES[kind]).action.path).toBe(path);
    });
  });

  describe('footer', () => {
    it.each(['proposal-submitted', 'usage-threshold', 'round-closing'] as const)('should say how to turn %s mails off on the profile page', (kind) => {
      const mail = renderMail(EXAMPLES[kind], reader, PUBLIC_URL);
      expect(mail.text).toContain('Turn it off on your profile page: https://localis.example.org/profile');
      expect(mail.html).toContain('href="https://localis.example.org/profile"');
    });

    it.each(['review-assigned', 'decision'] as const)('should say that %s mails always go out', (kind) => {
      const mail = renderMail(EXAMPLES[kind], reader, PUBLIC_URL);
      expect(mail.text).toContain('This mail always goes out');
      expect(mail.text).not.toContain('/profile');
    });
  });

  describe('escaping', () => {
    it('should escape a title with a script tag in the HTML and keep it readable in the text', () => {
      const title = '<script>alert("x")</script> & W > 16.5';
      const mail = renderMail({ ...EXAMPLES['proposal-submitted'], title }, { name: "O'Brien <admin>" }, PUBLIC_URL);
      expect(mail.html).not.toContain('<script>');
      expect(mail.html).not.toContain('<admin>');
      expect(mail.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; W &gt; 16.5');
      expect(mail.html).toContain('Hello O&#39;Brien &lt;admin&gt;,');
      expect(mail.text).toContain(title);
      expect(mail.subject).toBe(`New proposal: ${title}`);
    });

    it('should escape the office message and keep its line breaks', () => {
      const message = 'Fine <b>work</b>.\nSee "section 2".';
      const mail = renderMail({ ...EXAMPLES.decision, message }, reader, PUBLIC_URL);
      expect(mail.html).toContain('Fine &lt;b&gt;work&lt;/b&gt;.<br>See &quot;section 2&quot;.');
      expect(mail.text).toContain('> Fine <b>work</b>.\n> See "section 2".');
    });

    it('should put a title with line breaks on one subject line', () => {
      const mail = renderMail({ ...EXAMPLES['review-assigned'], title: 'Two\r\nBcc: someone@else.example' }, reader, PUBLIC_URL);
      expect(mail.subject).toBe('Please review: Two Bcc: someone@else.example');
    });

    it('should escape the five characters HTML gives meaning to', () => {
      expect(escapeHtml(`<a href="x" title='y'>&</a>`)).toBe('&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;');
    });
  });

  describe('content', () => {
    it('should state the grant, the request and the date in UTC when partly granted', () => {
      const c = notificationContent(EXAMPLES.decision);
      expect(c.title).toBe('Partly granted: Critical exponent of the 3D Anderson model');
      expect(c.summary).toContain('800,000 core-hours of the 1,250,000 core-hours requested');
      expect(c.summary).toMatch(/31 Mar 2028.*23:59 UTC/);
      expect(c.quote).toEqual({ label: 'Message from the office', text: 'Strong case.\nThe largest size is not funded.' });
    });

    it('should leave the quote out when the office wrote no message', () => {
      expect(notificationContent({ ...EXAMPLES.decision, outcome: 'declined', grantedCoreHours: 0, message: null }).quote).toBeUndefined();
    });

    it('should give usage with up to three decimals and the share used', () => {
      const c = notificationContent(EXAMPLES['usage-threshold']);
      expect(c.title).toBe('90 % of the grant used: Critical exponent of the 3D Anderson model');
      expect(c.summary).toContain('912.5 core-hours of its 1,000 core-hours (91 %)');
      expect(c.facts).toContainEqual(['Remaining', '87.5 core-hours']);
    });

    it('should say what happens next when a grant is used up, with and without an overdraft', () => {
      const none = notificationContent({ ...EXAMPLES['usage-threshold'], threshold: 100, usedCoreHours: 1000 });
      expect(none.title).toBe('Grant used up: Critical exponent of the 3D Anderson model');
      expect(none.summary).toContain('Further runs are refused');
      const some = notificationContent({ ...EXAMPLES['usage-threshold'], threshold: 100, usedCoreHours: 1000, overdraftPercent: 10 });
      expect(some.summary).toContain('up to 10 % beyond the grant');
    });

    it('should send a PI without drafts to a new proposal and an owner of several drafts to their campaigns', () => {
      const pi = notificationContent({ ...EXAMPLES['round-closing'], isPi: true, drafts: [] });
      expect(pi.action).toEqual({ label: 'Start a proposal', path: '/campaigns/new' });
      expect(pi.summary).not.toContain('Only the group’s PI');
      const owner = notificationContent({ ...EXAMPLES['round-closing'], drafts: [{ id: 'a', title: 'First' }, { id: 'b', title: 'Second' }] });
      expect(owner.action.path).toBe('/campaigns');
      expect(owner.summary).toContain('Your drafts in this round: “First”, “Second”.');
      expect(owner.summary).toContain('Only the group’s PI can submit');
    });

    it('should word the submission for the PI as a confirmation and for the office as work', () => {
      expect(notificationContent({ ...EXAMPLES['proposal-submitted'], audience: 'pi' }).title).toBe('Submitted: Critical exponent of the 3D Anderson model');
      expect(notificationContent(EXAMPLES['proposal-submitted']).summary).toContain('waits for reviewers');
    });
  });
});
