/**
 * A minimal Prometheus text-format registry (exposition format 0.0.4): request
 * counts and a latency histogram per route and status, plus process figures.
 * Small enough to own; avoids a dependency for a handful of series.
 */
const BUCKETS_S = [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10];

interface Histogram {
  counts: number[];
  sumS: number;
  count: number;
}

export class Metrics {
  private readonly requests = new Map<string, number>();
  private readonly durations = new Map<string, Histogram>();
  private readonly startedAtMs = Date.now();

  observe(method: string, route: string, status: number, durationS: number): void {
    const key = `method="${method}",route="${escapeLabel(route)}",status="${status}"`;
    this.requests.set(key, (this.requests.get(key) ?? 0) + 1);
    const hkey = `method="${method}",route="${escapeLabel(route)}"`;
    let h = this.durations.get(hkey);
    if (!h) {
      h = { counts: new Array<number>(BUCKETS_S.length).fill(0), sumS: 0, count: 0 };
      this.durations.set(hkey, h);
    }
    for (let i = 0; i < BUCKETS_S.length; i++) if (durationS <= BUCKETS_S[i]) h.counts[i]++;
    h.sumS += durationS;
    h.count++;
  }

  render(): string {
    const lines: string[] = [];
    lines.push('# HELP tickwright_http_requests_total HTTP requests by method, route and status.');
    lines.push('# TYPE tickwright_http_requests_total counter');
    for (const [labels, n] of this.requests) lines.push(`tickwright_http_requests_total{${labels}} ${n}`);
    lines.push('# HELP tickwright_http_request_duration_seconds Request latency.');
    lines.push('# TYPE tickwright_http_request_duration_seconds histogram');
    for (const [labels, h] of this.durations) {
      BUCKETS_S.forEach((le, i) => lines.push(`tickwright_http_request_duration_seconds_bucket{${labels},le="${le}"} ${h.counts[i]}`));
      lines.push(`tickwright_http_request_duration_seconds_bucket{${labels},le="+Inf"} ${h.count}`);
      lines.push(`tickwright_http_request_duration_seconds_sum{${labels}} ${h.sumS}`);
      lines.push(`tickwright_http_request_duration_seconds_count{${labels}} ${h.count}`);
    }
    const mem = process.memoryUsage();
    lines.push('# HELP tickwright_process_resident_memory_bytes Resident set size.');
    lines.push('# TYPE tickwright_process_resident_memory_bytes gauge');
    lines.push(`tickwright_process_resident_memory_bytes ${mem.rss}`);
    lines.push('# HELP tickwright_process_heap_used_bytes V8 heap in use.');
    lines.push('# TYPE tickwright_process_heap_used_bytes gauge');
    lines.push(`tickwright_process_heap_used_bytes ${mem.heapUsed}`);
    lines.push('# HELP tickwright_process_uptime_seconds Time since start.');
    lines.push('# TYPE tickwright_process_uptime_seconds gauge');
    lines.push(`tickwright_process_uptime_seconds ${(Date.now() - this.startedAtMs) / 1000}`);
    return lines.join('\n') + '\n';
  }
}

function escapeLabel(v: string): string {
  return v.replace(/\\/g, '\\\\').replace(/"/g, '\\"').replace(/\n/g, '\\n');
}
