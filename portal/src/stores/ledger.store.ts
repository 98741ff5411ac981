import type { AdjustmentInput, Ledger, LedgerEntry, RefundInput, RoundUsage, TransferInput } from '@localis/shared';
import { defineStore } from 'pinia';
import { ref } from 'vue';
import { ledgerApi, type TransferResult } from '../api/ledger.api';
import { isAbort, latestOnly } from './latest-only';

export const useLedgerStore = defineStore('ledger', () => {
  /** The ledger of the campaign a page shows: balances and entries. */
  const ledger = ref<Ledger | null>(null);
  const loading = ref(false);
  /** The pools of the round the usage page shows. */
  const usage = ref<RoundUsage | null>(null);
  const usageLoading = ref(false);
  const ledgerReads = latestOnly();
  const usageReads = latestOnly();

  /** Loads one campaign's ledger; a newer load (another campaign) wins over an older one. */
  async function load(campaignId: string): Promise<Ledger | null> {
    const { signal, isCurrent } = ledgerReads.begin();
    if (ledger.value?.campaignId !== campaignId) ledger.value = null;
    loading.value = true;
    try {
      const answer = await ledgerApi.get(campaignId, signal);
      if (!isCurrent()) return null;
      ledger.value = answer;
      return answer;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    } finally {
      if (isCurrent()) loading.value = false;
    }
  }

  /**
   * Balances are derived from all entries on the server (and alerts may have been sent), so
   * after a write the ledger is read again rather than patched here.
   */
  async function reloadAfter<T>(campaignId: string, write: Promise<T>): Promise<T> {
    const written = await write;
    await load(campaignId);
    return written;
  }

  const adjust = (campaignId: string, input: AdjustmentInput): Promise<LedgerEntry> => reloadAfter(campaignId, ledgerApi.adjust(campaignId, input));
  const transfer = (campaignId: string, input: TransferInput): Promise<TransferResult> => reloadAfter(campaignId, ledgerApi.transfer(campaignId, input));
  const refund = (campaignId: string, input: RefundInput): Promise<LedgerEntry> => reloadAfter(campaignId, ledgerApi.refund(campaignId, input));

  async function loadRoundUsage(roundId: string): Promise<RoundUsage | null> {
    const { signal, isCurrent } = usageReads.begin();
    if (usage.value?.roundId !== roundId) usage.value = null;
    usageLoading.value = true;
    try {
      const answer = await ledgerApi.roundUsage(roundId, signal);
      if (!isCurrent()) return null;
      usage.value = answer;
      return answer;
    } catch (error) {
      if (isAbort(error)) return null;
      throw error;
    } finally {
      if (isCurrent()) usageLoading.value = false;
    }
  }

  return { ledger, loading, usage, usageLoading, load, adjust, transfer, refund, loadRoundUsage };
});
