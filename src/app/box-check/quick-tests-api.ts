import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { QuickTestView } from '../../../shared/hub/messages';

/** Body of POST /api/quick-tests (the hub fills in the rest from the type and the bench). */
export interface StartQuickTest {
  benchId: number;
  valveType: string;
  valveId: number;
}

/** Quick tests over REST; the live socket carries their progress afterwards. */
@Injectable({ providedIn: 'root' })
export class QuickTestsApi {
  private readonly http = inject(HttpClient);

  start(body: StartQuickTest): Observable<QuickTestView> {
    return this.http.post<QuickTestView>('/api/quick-tests', body);
  }

  get(id: number): Observable<QuickTestView> {
    return this.http.get<QuickTestView>(`/api/quick-tests/${id}`);
  }

  abort(id: number): Observable<unknown> {
    return this.http.post(`/api/quick-tests/${id}/abort`, {});
  }
}
