import { NOTIFICATION_KIND_LABELS } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { mailKindLabel } from './mail-kind-label';

describe('mailKindLabel', () => {
  describe('proposal submissions', () => {
    it('should speak of every group when the reader is in the office', () => {
      expect(mailKindLabel('proposal-submitted', true)).toBe('Any group submits a proposal');
    });

    it('should speak of the reader’s own group when the reader is not in the office', () => {
      expect(mailKindLabel('proposal-submitted', false)).toBe('Your group submits a proposal');
    });
  });

  describe('other kinds', () => {
    it.each(['usage-threshold', 'round-closing'] as const)('should keep the shared label for %s', (kind) => {
      expect(mailKindLabel(kind, true)).toBe(NOTIFICATION_KIND_LABELS[kind]);
      expect(mailKindLabel(kind, false)).toBe(NOTIFICATION_KIND_LABELS[kind]);
    });
  });
});
