/**
 * Published values Localis relies on, with their sources, so the notices, the analyses and the
 * tests quote one place. Conventions: hopping t = 1, box disorder of width W, energy E.
 */
export const ANDERSON_3D_ORTHOGONAL = {
  /** Critical disorder at E = 0, box disorder, transfer-matrix, periodic boundaries. */
  criticalDisorder: 16.54,
  criticalDisorderError: 0.02,
  exponentNu: 1.57,
  exponentNuError: 0.02,
  criticalLambda: 0.576,
  criticalLambdaError: 0.002,
  source: 'Slevin & Ohtsuki, PRL 82, 382 (1999)',
} as const;

/** Critical exponents of other universality classes, for messages and later comparisons. */
export const CRITICAL_EXPONENTS = {
  unitary3d: { nu: 1.43, error: 0.04, source: 'Slevin & Ohtsuki, PRL 78, 4083 (1997)' },
  symplectic2d: { nu: 2.73, error: 0.02, source: 'Asada, Slevin & Ohtsuki, PRL 89, 256601 (2002)' },
  quantumHall: { nu: 2.593, lo: 2.587, hi: 2.598, source: 'Slevin & Ohtsuki, PRB 80, 041304(R) (2009)' },
} as const;
