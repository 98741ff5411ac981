import type { CampaignPermissions, CampaignSummary } from '@localis/shared';
import { formatCoreHours } from '../../../lib/units';

/** The state changes a person can make from a campaign's page. */
export type TransitionAction = 'submit' | 'withdraw' | 'start-review';

export interface TransitionText {
  /** The button on the page. */
  button: string;
  icon: string;
  testId: string;
  /** The question in the dialog. */
  header: string;
  message: (c: CampaignSummary) => string;
  noteHint: string;
  accept: string;
  danger: boolean;
  success: string;
  failure: string;
}

export const TRANSITIONS: Record<TransitionAction, TransitionText> = {
  submit: {
    button: 'Submit',
    icon: 'pi pi-send',
    testId: 'submit-campaign',
    header: 'Submit this proposal?',
    message: (c) =>
      `“${c.title}” goes to the allocation committee of ${c.roundName}, asking for ${formatCoreHours(c.requestedCoreHours)} on ${c.machine}. ` +
      'From then on it can no longer be edited; it can still be withdrawn until a decision is made.',
    noteHint: 'Optional: anything the committee should know, e.g. how this relates to an earlier proposal.',
    accept: 'Submit proposal',
    danger: false,
    success: 'Proposal submitted',
    failure: 'The proposal was not submitted',
  },
  withdraw: {
    button: 'Withdraw',
    icon: 'pi pi-undo',
    testId: 'withdraw-campaign',
    header: 'Withdraw this campaign?',
    message: (c) =>
      `“${c.title}” will be withdrawn for good: it leaves the round and cannot be submitted or edited again. ` +
      'To propose it later, start a new campaign.',
    noteHint: 'Optional: why, for the record (e.g. merged into another proposal).',
    accept: 'Withdraw campaign',
    danger: true,
    success: 'Campaign withdrawn',
    failure: 'The campaign was not withdrawn',
  },
  'start-review': {
    button: 'Start review',
    icon: 'pi pi-eye',
    testId: 'start-review',
    header: 'Start the review?',
    message: (c) => `“${c.title}” moves to the committee's review. Its owner and PI see that the review has begun.`,
    noteHint: 'Optional: a note for the history, e.g. the reviewers assigned.',
    accept: 'Start review',
    danger: false,
    success: 'Review started',
    failure: 'The review was not started',
  },
};

/** The state changes the server says this person may make now, in the order the buttons show. */
export function availableTransitions(can: CampaignPermissions): TransitionAction[] {
  const out: TransitionAction[] = [];
  if (can.submit) out.push('submit');
  if (can.startReview) out.push('start-review');
  if (can.withdraw) out.push('withdraw');
  return out;
}
