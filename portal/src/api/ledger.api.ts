import type { AdjustmentInput, Ledger, LedgerEntry, RefundInput, RoundUsage, TransferInput } from '@localis/shared';
import { http } from './http-client';

const ledgerOf = (campaignId: string) => `/campaigns/${encodeURIComponent(campaignId)}/ledger`;

/** A transfer writes two entries: the debit on the giving campaign and the credit on the receiving one. */
export interface TransferResult {
  from: LedgerEntry;
  to: LedgerEntry;
}

export const ledgerApi = {
  /** Balances and every entry, oldest first, each with the balance just after it. */
  get: (campaignId: string, signal?: AbortSignal) => http.get<Ledger>(ledgerOf(campaignId), undefined, signal),
  adjust: (campaignId: string, input: AdjustmentInput) => http.post<LedgerEntry>(`${ledgerOf(campaignId)}/adjustments`, input),
  transfer: (campaignId: string, input: TransferInput) => http.post<TransferResult>(`${ledgerOf(campaignId)}/transfers`, input),
  refund: (campaignId: string, input: RefundInput) => http.post<LedgerEntry>(`${ledgerOf(campaignId)}/refunds`, input),
  /** A round's pools: per machine what is granted, used and still free, by group. */
  roundUsage: (roundId: string, signal?: AbortSignal) => http.get<RoundUsage>(`/rounds/${encodeURIComponent(roundId)}/usage`, undefined, signal),
};
