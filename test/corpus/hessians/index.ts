// The exactly derived Hessians of the corpus's learning-rate modules, keyed by the module's
// path relative to fixtures/realistic. Each file sits at hessians/<module path without extension>.ts.

import * as softmax from './classifier/softmax';
import * as ridge from './bakery/ridge';
import * as hiveWeight from './beekeeping/hive-weight';
import * as sag from './bridge/sag';
import * as poisson from './callcentre/poisson';
import * as pose2d from './camera/pose2d';
import * as pseudoHuber from './delivery/pseudo-huber';
import * as polyfit from './lab/polyfit';
import * as frostRisk from './orchard/frost-risk';
import * as portfolio from './pension/portfolio';
import * as armIk from './pickplace/arm-ik';
import * as scorer from './shop-spam/scorer';
import * as harmonic from './tides/harmonic';
import * as smile from './options/smile';
import * as depot from './depot/depot';

export interface ExactDerivatives {
  start: number[];
  gradient(x: number[]): number[];
  hessian(x: number[]): number[][];
}

export const hessians: Record<string, ExactDerivatives> = {
  'bakery/ridge.ts': ridge,
  'beekeeping/hive-weight.ts': hiveWeight,
  'bridge/sag.js': sag,
  'callcentre/poisson.ts': poisson,
  'camera/pose2d.ts': pose2d,
  'classifier/softmax.ts': softmax,
  'delivery/pseudo-huber.js': pseudoHuber,
  'lab/polyfit.ts': polyfit,
  'orchard/frost-risk.ts': frostRisk,
  'pension/portfolio.ts': portfolio,
  'pickplace/arm-ik.ts': armIk,
  'shop-spam/scorer.ts': scorer,
  'tides/harmonic.ts': harmonic,
  'options/smile.ts': smile,
  'depot/depot.ts': depot,
};
