import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditLog } from '../db/models';
import { startTestApp, SYSTEM, type TestApp } from '../../test/harness';
import { auditService } from './audit.service';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => t.close());

describe('audit log', () => {
  describe('append-only', () => {
    it('should refuse edits and deletions in the database itself', async () => {
      await auditService.record(SYSTEM, 'test.appended', { type: 'test', id: 'append-only' });
      const row = await AuditLog.findOne({ where: { targetId: 'append-only' } });
      await expect(AuditLog.update({ action: 'test.rewritten' }, { where: { id: row!.id } })).rejects.toThrow(/append-only/);
      await expect(AuditLog.destroy({ where: { id: row!.id } })).rejects.toThrow(/append-only/);
    });
  });

  describe('secrets', () => {
    it('should remove secret-looking details when an entry is written', async () => {
      await auditService.record(SYSTEM, 'test.secret', { type: 'test', id: 'scrubbed' }, { password: 'hunter2', secretValue: 'x', tokenName: 'kept' });
      const row = await AuditLog.findOne({ where: { targetId: 'scrubbed' } });
      expect(row!.details).toEqual({ password: '[removed]', secretValue: '[removed]', tokenName: 'kept' });
    });
  });

  describe('transactions', () => {
    it('should leave no entry when the change it describes fails', async () => {
      await expect(
        t.db.transaction(async (tx) => {
          await auditService.record(SYSTEM, 'test.rolled-back', { type: 'test', id: 'rolled-back' }, {}, tx);
          throw new Error('the change failed');
        }),
      ).rejects.toThrow('the change failed');
      expect(await AuditLog.count({ where: { targetId: 'rolled-back' } })).toBe(0);
    });
  });
});
