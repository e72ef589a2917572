import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { BenchView } from '../../../shared/hub/messages';

/** Reads benches over REST (the live socket keeps them current afterwards). */
@Injectable({ providedIn: 'root' })
export class BenchesApi {
  private readonly http = inject(HttpClient);

  list(): Observable<BenchView[]> {
    return this.http.get<BenchView[]>('/api/benches');
  }
}
