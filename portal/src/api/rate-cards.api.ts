import type { RateCard, RateCardInput, RateCardList } from '@localis/shared';
import { http } from './http-client';

const cardsOf = (institutionId: string) => `/institutions/${encodeURIComponent(institutionId)}/rate-cards`;

export const rateCardsApi = {
  /** A partner's rate cards, newest first (the office and the partner's own billing contacts). */
  list: (institutionId: string, signal?: AbortSignal) => http.get<RateCardList>(cardsOf(institutionId), undefined, signal),
  /** A new card from a date on; the server closes the one before it the day before. */
  create: (institutionId: string, input: RateCardInput) => http.post<RateCard>(cardsOf(institutionId), input),
};
