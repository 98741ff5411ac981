import type { ScalingFit } from './scaling-fit';
import { scalingLayout } from './scaling-model';
import { validatePoints, type ScalingPoint } from './scaling-table';

/**
 * The data collapse of a fit, for the analysis page's plot: every point moved to its relevant
 * scaling variable psi = chi_r(w) L^(1/nu), with the fitted irrelevant correction
 * F(psi, phi) - F(psi, 0) taken out of ln value, so that all sizes should fall on one curve,
 * exp(F(psi, 0)), which is sampled alongside. The relative error of a point is unchanged.
 */
export interface CollapsePoint {
  L: number;
  x: number;
  scalingVariable: number;
  value: number;
  error: number;
}

export interface DataCollapse {
  points: CollapsePoint[];
  /** exp(F(psi, 0)) at evenly spaced psi over the points' range. */
  curve: { scalingVariable: number; value: number }[];
}

export function dataCollapse(points: readonly ScalingPoint[], fit: ScalingFit, curvePoints = 101): DataCollapse {
  const layout = scalingLayout(fit.orders, fit.variable);
  const p = fit.parameters.map((q) => q.value);
  const { nr, ni, mr, mi } = fit.orders;
  const [xc, nu] = p;
  const y = layout.y >= 0 ? p[layout.y] : 0;
  const a = (i: number, j: number) => p[layout.a + i * (nr + 1) + j];
  const relevantF = (psi: number) => {
    let s = 0;
    for (let j = nr; j >= 0; j--) s = s * psi + a(0, j);
    return s;
  };

  const collapsed = validatePoints(points, fit).map((pt) => {
    const w = (xc - pt.x) / xc;
    let chir = w;
    for (let m = 2; m <= mr; m++) chir += p[layout.b + m - 2] * w ** m;
    const psi = chir * pt.L ** (1 / nu);
    let irrelevant = 0;
    if (ni > 0) {
      let chii = 1;
      for (let m = 1; m <= mi; m++) chii += p[layout.c + m - 1] * w ** m;
      const phi = chii * pt.L ** -y;
      for (let i = 1; i <= ni; i++) {
        let inner = 0;
        for (let j = nr; j >= 0; j--) inner = inner * psi + a(i, j);
        irrelevant += inner * phi ** i;
      }
    }
    const factor = Math.exp(-irrelevant);
    return { L: pt.L, x: pt.x, scalingVariable: psi, value: pt.value * factor, error: pt.error * factor };
  });

  const lo = Math.min(...collapsed.map((c) => c.scalingVariable));
  const hi = Math.max(...collapsed.map((c) => c.scalingVariable));
  const curve = Array.from({ length: curvePoints }, (_, k) => {
    const psi = curvePoints === 1 ? lo : lo + ((hi - lo) * k) / (curvePoints - 1);
    return { scalingVariable: psi, value: Math.exp(relevantF(psi)) };
  });
  return { points: collapsed, curve };
}
