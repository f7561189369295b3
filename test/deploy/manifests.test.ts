/**
 * Deployment files, checked without a cluster or a Docker engine:
 * - every Kubernetes manifest validates against the Kubernetes API schemas
 *   (kubernetes-models, generated from the upstream OpenAPI definitions), plus the
 *   operational promises the README makes (probes, limits, non-root, read-only root);
 * - the compose file's structure: PostgreSQL, two replicas and a proxy, health checks,
 *   and environment that the service's own configuration reader accepts.
 */
import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Deployment } from 'kubernetes-models/apps/v1/Deployment';
import { HorizontalPodAutoscaler } from 'kubernetes-models/autoscaling/v2/HorizontalPodAutoscaler';
import { PodDisruptionBudget } from 'kubernetes-models/policy/v1/PodDisruptionBudget';
import { ConfigMap } from 'kubernetes-models/v1/ConfigMap';
import { Secret } from 'kubernetes-models/v1/Secret';
import { Service } from 'kubernetes-models/v1/Service';
import { describe, expect, it } from 'vitest';
import { parse, parseAllDocuments } from 'yaml';
import { configFromEnv } from '../../src/config.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
const k8sDir = path.join(root, 'deploy', 'kubernetes');

type Manifest = { apiVersion: string; kind: string; metadata: { name: string }; [key: string]: unknown };

const MODELS: Record<string, new (data: never) => { validate(): void }> = {
  'apps/v1/Deployment': Deployment,
  'autoscaling/v2/HorizontalPodAutoscaler': HorizontalPodAutoscaler,
  'policy/v1/PodDisruptionBudget': PodDisruptionBudget,
  'v1/ConfigMap': ConfigMap,
  'v1/Secret': Secret,
  'v1/Service': Service,
};

function manifests(): Array<{ file: string; doc: Manifest }> {
  const out: Array<{ file: string; doc: Manifest }> = [];
  for (const file of readdirSync(k8sDir).filter((f) => f.endsWith('.yaml') && f !== 'kustomization.yaml').sort()) {
    for (const document of parseAllDocuments(readFileSync(path.join(k8sDir, file), 'utf8'))) {
      if (document.errors.length > 0) throw new Error(`${file}: ${document.errors[0].message}`);
      out.push({ file, doc: document.toJS() as Manifest });
    }
  }
  return out;
}

function one(kind: string): Manifest {
  const found = manifests().filter((m) => m.doc.kind === kind);
  expect(found, kind).toHaveLength(1);
  return found[0].doc;
}

// Loose shapes for reading the parsed objects in assertions.
type Probe = { httpGet?: { path: string; port: string | number } };
type Container = {
  name: string;
  ports: Array<{ name: string; containerPort: number }>;
  resources: { requests: Record<string, string>; limits: Record<string, string> };
  livenessProbe: Probe;
  readinessProbe: Probe;
  securityContext: { readOnlyRootFilesystem: boolean; allowPrivilegeEscalation: boolean; runAsNonRoot?: boolean; capabilities: { drop: string[] } };
  volumeMounts: Array<{ name: string; mountPath: string }>;
  envFrom: Array<{ configMapRef?: { name: string } }>;
  env: Array<{ name: string; valueFrom?: { secretKeyRef?: { name: string; key: string } } }>;
};
type PodSpec = {
  securityContext: { runAsNonRoot: boolean; runAsUser: number };
  containers: Container[];
  volumes: Array<{ name: string; emptyDir?: object }>;
};

describe('Kubernetes manifests', () => {
  it('every object validates against the Kubernetes API schema of its kind', () => {
    const all = manifests();
    expect(all.map((m) => m.doc.kind).sort()).toEqual(['ConfigMap', 'Deployment', 'HorizontalPodAutoscaler', 'PodDisruptionBudget', 'Secret', 'Service']);
    for (const { file, doc } of all) {
      const Model = MODELS[`${doc.apiVersion}/${doc.kind}`];
      expect(Model, `${file}: no schema for ${doc.apiVersion} ${doc.kind}`).toBeDefined();
      expect(() => new Model(doc as never).validate(), file).not.toThrow();
    }
  });

  it('the schema check can fail: a string container port is rejected', () => {
    const deployment = structuredClone(one('Deployment')) as Manifest & { spec: { template: { spec: PodSpec } } };
    (deployment.spec.template.spec.containers[0].ports[0] as { containerPort: unknown }).containerPort = 'http';
    expect(() => new Deployment(deployment as never).validate()).toThrow(/containerPort/);
  });

  it('the kustomization lists every manifest file', () => {
    const kustomization = parse(readFileSync(path.join(k8sDir, 'kustomization.yaml'), 'utf8')) as { resources: string[] };
    const files = readdirSync(k8sDir).filter((f) => f.endsWith('.yaml') && f !== 'kustomization.yaml');
    expect([...kustomization.resources].sort()).toEqual(files.sort());
  });

  it('the Deployment probes /healthz and /readyz, sets requests and limits, runs non-root on a read-only root', () => {
    const deployment = one('Deployment') as Manifest & { spec: { replicas: number; selector: { matchLabels: Record<string, string> }; template: { metadata: { labels: Record<string, string> }; spec: PodSpec } } };
    const pod = deployment.spec.template.spec;
    const [container] = pod.containers;
    expect(container.livenessProbe.httpGet).toMatchObject({ path: '/healthz', port: 'http' });
    expect(container.readinessProbe.httpGet).toMatchObject({ path: '/readyz', port: 'http' });
    expect(container.ports).toContainEqual(expect.objectContaining({ name: 'http', containerPort: 8080 }));
    for (const key of ['cpu', 'memory']) {
      expect(container.resources.requests[key], `requests.${key}`).toBeDefined();
      expect(container.resources.limits[key], `limits.${key}`).toBeDefined();
    }
    expect(pod.securityContext.runAsNonRoot).toBe(true);
    expect(pod.securityContext.runAsUser).toBeGreaterThan(0);
    expect(container.securityContext).toMatchObject({ readOnlyRootFilesystem: true, allowPrivilegeEscalation: false });
    expect(container.securityContext.capabilities.drop).toContain('ALL');
    // A writable scratch /tmp from an emptyDir, since the root filesystem is read-only.
    const tmp = container.volumeMounts.find((v) => v.mountPath === '/tmp');
    expect(tmp).toBeDefined();
    expect(pod.volumes.find((v) => v.name === tmp!.name)?.emptyDir).toBeDefined();
    // The pod template carries the selector's labels (else the API server rejects the Deployment).
    expect(deployment.spec.template.metadata.labels).toMatchObject(deployment.spec.selector.matchLabels);
  });

  it('settings come from the ConfigMap, keys and the database URL from the Secret, and the service accepts them', () => {
    const deployment = one('Deployment') as Manifest & { spec: { template: { spec: PodSpec } } };
    const configMap = one('ConfigMap') as Manifest & { data: Record<string, string> };
    const secret = one('Secret') as Manifest & { stringData: Record<string, string> };
    const [container] = deployment.spec.template.spec.containers;
    expect(container.envFrom.map((e) => e.configMapRef?.name)).toContain(configMap.metadata.name);
    const fromSecret = Object.fromEntries(container.env.map((e) => [e.name, e.valueFrom?.secretKeyRef]));
    expect(fromSecret.TICKWRIGHT_DATABASE_URL).toEqual({ name: secret.metadata.name, key: 'database-url' });
    expect(fromSecret.TICKWRIGHT_API_KEYS).toEqual({ name: secret.metadata.name, key: 'api-keys' });
    for (const ref of Object.values(fromSecret)) expect(Object.keys(secret.stringData)).toContain(ref!.key);
    // No secret material in the ConfigMap.
    expect(Object.keys(configMap.data).filter((k) => /KEY|PASSWORD|DATABASE_URL/.test(k))).toEqual([]);
    // The environment a pod would see parses with the service's own reader.
    const config = configFromEnv({ ...configMap.data, TICKWRIGHT_DATABASE_URL: secret.stringData['database-url'], TICKWRIGHT_API_KEYS: secret.stringData['api-keys'] });
    expect(config.databaseUrl).toMatch(/^postgres:\/\//);
    expect(config.port).toBe(8080);
    expect(config.databasePoolSize).toBeGreaterThan(0);
  });

  it('the Service, autoscaler and disruption budget select the Deployment', () => {
    const deployment = one('Deployment') as Manifest & { spec: { selector: { matchLabels: Record<string, string> }; template: { metadata: { labels: Record<string, string> } } } };
    const labels = deployment.spec.template.metadata.labels;
    const service = one('Service') as Manifest & { spec: { selector: Record<string, string>; ports: Array<{ targetPort: string }> } };
    expect(labels).toMatchObject(service.spec.selector);
    expect(service.spec.ports[0].targetPort).toBe('http');
    const pdb = one('PodDisruptionBudget') as Manifest & { spec: { minAvailable: number; selector: { matchLabels: Record<string, string> } } };
    expect(labels).toMatchObject(pdb.spec.selector.matchLabels);
    const hpa = one('HorizontalPodAutoscaler') as Manifest & { spec: { scaleTargetRef: { kind: string; name: string }; minReplicas: number; metrics: Array<{ resource: { name: string } }> } };
    expect(hpa.spec.scaleTargetRef).toMatchObject({ kind: 'Deployment', name: deployment.metadata.name });
    expect(hpa.spec.metrics.map((m) => m.resource.name)).toEqual(['cpu']);
    // With at least two replicas, a budget of one available pod still lets a node drain.
    expect(hpa.spec.minReplicas).toBeGreaterThan(pdb.spec.minAvailable);
  });
});

describe('docker/compose.yaml', () => {
  type ComposeService = {
    image?: string;
    build?: unknown;
    environment?: Record<string, string>;
    healthcheck?: { test: string[] };
    depends_on?: Record<string, { condition: string }>;
    ports?: string[];
    volumes?: string[];
    read_only?: boolean;
  };
  const compose = parse(readFileSync(path.join(root, 'docker', 'compose.yaml'), 'utf8'), { merge: true }) as { services: Record<string, ComposeService> };
  const nginx = readFileSync(path.join(root, 'docker', 'nginx.conf'), 'utf8');

  /** Compose's ${VAR:-default} interpolation, with the defaults (nothing set in the environment). */
  function interpolate(value: string): string {
    return value.replace(/\$\{([A-Z_]+):-([^}]*)\}/g, (_m, _name, fallback: string) => fallback);
  }

  it('runs PostgreSQL, two replicas and a proxy, each with a health check', () => {
    const { services } = compose;
    expect(Object.keys(services).sort()).toEqual(['postgres', 'proxy', 'tickwright-a', 'tickwright-b']);
    for (const [name, service] of Object.entries(services)) expect(service.healthcheck?.test.length, name).toBeGreaterThan(0);
    expect(services.postgres.healthcheck!.test).toContain('pg_isready');
    for (const name of ['tickwright-a', 'tickwright-b']) {
      expect(services[name].healthcheck!.test.join(' ')).toContain('/readyz');
      expect(services[name].depends_on?.postgres.condition).toBe('service_healthy');
      expect(services[name].read_only).toBe(true);
    }
    expect(services.proxy.depends_on).toMatchObject({ 'tickwright-a': { condition: 'service_healthy' }, 'tickwright-b': { condition: 'service_healthy' } });
    expect(services.proxy.ports).toContain('8080:8080');
    expect(services.proxy.volumes?.some((v) => v.startsWith('./nginx.conf:'))).toBe(true);
  });

  it('points both replicas at the compose PostgreSQL with settings the service accepts', () => {
    const pg = compose.services.postgres.environment!;
    for (const name of ['tickwright-a', 'tickwright-b']) {
      const env = Object.fromEntries(Object.entries(compose.services[name].environment!).map(([k, v]) => [k, interpolate(String(v))]));
      const config = configFromEnv(env);
      const url = new URL(config.databaseUrl!);
      expect(url.protocol).toBe('postgres:');
      expect(url.hostname).toBe('postgres');
      expect(decodeURIComponent(url.username)).toBe(pg.POSTGRES_USER);
      expect(decodeURIComponent(url.password)).toBe(interpolate(pg.POSTGRES_PASSWORD));
      expect(url.pathname).toBe(`/${pg.POSTGRES_DB}`);
    }
  });

  it('the proxy balances over both replicas on the port they listen on', () => {
    const upstream = /upstream\s+tickwright\s*\{([^}]*)\}/.exec(nginx)?.[1] ?? '';
    const servers = [...upstream.matchAll(/server\s+([a-z0-9-]+):(\d+)/g)].map((m) => `${m[1]}:${m[2]}`);
    expect(servers.sort()).toEqual(['tickwright-a:8080', 'tickwright-b:8080']);
    expect(nginx).toMatch(/proxy_pass\s+http:\/\/tickwright;/);
    expect(nginx).toMatch(/listen\s+8080;/);
  });
});
