import { Injectable } from '@angular/core';
import { fitKorenModel, type KorenFit } from '../../../shared/analysis/koren-fit';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import type { Refusal } from '../../../shared/analysis/refusal';
import type { SweepPoint } from '../../../shared/domain/sweep';

/** What the fit worker is sent. */
export interface FitRequest {
  points: readonly SweepPoint[];
  start: KorenModel;
}

/**
 * Fits Koren models off the main thread, so the crosshair stays smooth while a few hundred
 * readings are fitted. Where no Worker exists (jsdom) or the worker fails to start, the fit runs
 * on the main thread after a yield, so a spinner gets painted first.
 */
@Injectable({ providedIn: 'root' })
export class ModelFitter {
  fit(points: readonly SweepPoint[], start: KorenModel): Promise<KorenFit | Refusal> {
    const request: FitRequest = { points: [...points], start };
    if (typeof Worker !== 'function') return fitOnMainThread(request);
    return new Promise((resolve) => {
      let worker: Worker;
      try {
        worker = new Worker(new URL('./fit.worker', import.meta.url), { type: 'module' });
      } catch {
        resolve(fitOnMainThread(request));
        return;
      }
      worker.onmessage = (event: MessageEvent<KorenFit | Refusal>) => {
        worker.terminate();
        resolve(event.data);
      };
      worker.onerror = (event) => {
        event.preventDefault();
        worker.terminate();
        resolve(fitOnMainThread(request));
      };
      worker.postMessage(request);
    });
  }
}

async function fitOnMainThread(request: FitRequest): Promise<KorenFit | Refusal> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  return fitKorenModel(request.points, request.start);
}
