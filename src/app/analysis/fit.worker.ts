// The Koren fit, run in a Web Worker by ModelFitter. Typed against the DOM library because the
// app compiles with one tsconfig: addEventListener and postMessage have the same shape there.
import { fitKorenModel } from '../../../shared/analysis/koren-fit';
import type { FitRequest } from './model-fitter';

addEventListener('message', (event: MessageEvent<FitRequest>) => {
  postMessage(fitKorenModel(event.data.points, event.data.start));
});
