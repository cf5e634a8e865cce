/**
 * The live preview: a local HTTP server (node:http) with a page where a user opens a frame, clicks or
 * drags the gaze and changes age, refraction, pupil, light and distance; the percept and the label
 * verdicts update without reloading. The core runs unchanged behind it: prepareProof once per frame
 * and viewer, lookAt (reusing the last gaze's arrays) per gaze.
 *
 * It serves only its user: it binds to 127.0.0.1 unless told otherwise; it refuses requests whose
 * Host or Origin is not its own (DNS rebinding); it caps bodies (frames MAX_FRAME_BYTES, JSON
 * MAX_JSON_BYTES) and frames (MAX_PREVIEW_PIXELS); it serves fixed in-memory assets and never reads a
 * path a request names; every response carries a strict Content Security Policy; it keeps one frame
 * and one prepared proof per session, a few sessions at most, and one computation at a time.
 */
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import sharp from 'sharp';
import { detectTextRuns, type DetectedRun } from '../analysis/detect-text.js';
import { countedJudgement, type LabelVerdict } from '../analysis/labels.js';
import { displayPresets } from '../config/presets.js';
import { validateSetup } from '../config/validate.js';
import { ConfigError, InputError } from '../errors.js';
import { decodeFrame } from '../io/decode-frame.js';
import { linearToRgba8 } from '../io/encode-png.js';
import type { LinearRgb } from '../image/plane.js';
import { lookAt, prepareProof, type PreparedProof, type ProofResult } from '../pipeline.js';
import { CAUTION_SHORT } from '../report/cautions.js';
import { PREVIEW_CSS, PREVIEW_HTML, PREVIEW_JS } from './preview-page.js';

export const MAX_FRAME_BYTES = 32 * 1024 * 1024;
export const MAX_JSON_BYTES = 64 * 1024;
/** Largest frame the preview takes: 3840×2160 (the proof's default limit). */
export const MAX_PREVIEW_PIXELS = 3840 * 2160;
/**
 * The preview works on the frame scaled to at most this width, so that a gaze change stays well
 * under a second on an ordinary CPU; `eyeproof proof` works at full size. The display's geometry is
 * unchanged (the pixel ratio follows), so sizes and verdicts are those of the full frame to within
 * its resampling.
 */
export const PREVIEW_WIDTH_PX = 1280;
const MAX_SESSIONS = 4;

export interface PreviewOptions {
  host?: string;
  port?: number;
  /** Said once when the server is exposed beyond this machine. */
  onWarning?: (text: string) => void;
}

export interface PreviewServer {
  url: string;
  server: Server;
  close(): Promise<void>;
}

interface Session {
  id: string;
  frame: LinearRgb;
  labels: DetectedRun[];
  prepared?: { key: string; proof: PreparedProof };
  last?: ProofResult;
  used: number;
  /** The uploaded frame's own size (the preview may work on a smaller copy). */
  fullSize: [number, number];
}

interface LookRequest {
  frameId: string;
  gazePx: [number, number];
  display: string;
  distanceMm: number;
  ageYears: number;
  sphereD: number;
  pupilMm: number | 'auto';
  lightCdM2: number | 'auto';
}

const CSP = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data: blob:; connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

class HttpError extends Error {
  constructor(readonly status: number, message: string) {
    super(message);
  }
}

function send(res: ServerResponse, status: number, type: string, body: string | Buffer): void {
  res.writeHead(status, {
    'Content-Type': type, 'Content-Length': Buffer.byteLength(body), 'Content-Security-Policy': CSP, 'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer', 'Cache-Control': 'no-store', 'Cross-Origin-Resource-Policy': 'same-origin',
  });
  res.end(body);
}

const json = (res: ServerResponse, status: number, value: unknown): void => send(res, status, 'application/json; charset=utf-8', JSON.stringify(value));

/**
 * Reads a request body up to a cap. A larger one is refused (413): nothing more is kept, the rest is
 * drained so the answer reaches the client, and the connection is closed after it.
 */
function readBody(req: IncomingMessage, res: ServerResponse, cap: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const declared = Number(req.headers['content-length'] ?? NaN);
    let refused = declared > cap;
    const chunks: Buffer[] = [];
    let size = 0;
    const refuse = (): void => {
      res.setHeader('Connection', 'close');
      reject(new HttpError(413, `the body is over ${cap} bytes`));
    };
    if (refused) refuse();
    req.on('data', (c: Buffer) => {
      if (refused) return;
      size += c.length;
      if (size > cap) {
        refused = true;
        chunks.length = 0;
        refuse();
        return;
      }
      chunks.push(c);
    });
    req.on('end', () => { if (!refused) resolve(Buffer.concat(chunks)); });
    req.on('error', reject);
  });
}

function number(v: unknown, name: string, lo: number, hi: number): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < lo || v > hi) throw new HttpError(400, `${name} must be a number from ${lo} to ${hi}`);
  return v;
}

function parseLook(body: Buffer): LookRequest {
  let raw: Record<string, unknown>;
  try {
    raw = JSON.parse(body.toString('utf8')) as Record<string, unknown>;
  } catch {
    throw new HttpError(400, 'the body is not JSON');
  }
  if (!raw || typeof raw !== 'object') throw new HttpError(400, 'the body is not a JSON object');
  const gaze = raw.gazePx;
  if (!Array.isArray(gaze) || gaze.length !== 2) throw new HttpError(400, 'gazePx must be [x, y]');
  const display = typeof raw.display === 'string' && displayPresets.some((p) => p.name === raw.display) ? raw.display : undefined;
  if (!display) throw new HttpError(400, `display must be one of ${displayPresets.map((p) => p.name).join(', ')}`);
  return {
    frameId: typeof raw.frameId === 'string' ? raw.frameId : '',
    gazePx: [number(gaze[0], 'gazePx[0]', -1e5, 1e5), number(gaze[1], 'gazePx[1]', -1e5, 1e5)],
    display,
    distanceMm: number(raw.distanceMm, 'distanceMm', 100, 20000),
    ageYears: number(raw.ageYears, 'ageYears', 10, 90),
    sphereD: number(raw.sphereD, 'sphereD', -10, 10),
    pupilMm: raw.pupilMm === 'auto' ? 'auto' : number(raw.pupilMm, 'pupilMm', 1.5, 8),
    lightCdM2: raw.lightCdM2 === 'auto' ? 'auto' : number(raw.lightCdM2, 'lightCdM2', 0.001, 10000),
  };
}

/** The setup of a look: the display preset (its distance changed for screens), the frame fitted into it. */
function setupFor(look: LookRequest, frame: LinearRgb): ReturnType<typeof validateSetup> {
  const preset = displayPresets.find((p) => p.name === look.display)!;
  const [dw, dh] = preset.values.resolutionPx as [number, number];
  // The frame keeps its aspect ratio, as large as it fits, centred.
  const s = Math.min(dw / frame.width, dh / frame.height);
  const [pw, ph] = [frame.width * s, frame.height * s];
  const placementPx = [(dw - pw) / 2, (dh - ph) / 2, pw, ph];
  const screen = preset.values.kind === 'screen';
  const gx = Math.min(frame.width * 3 - 1, Math.max(-2 * frame.width, Math.round(look.gazePx[0])));
  const gy = Math.min(frame.height * 3 - 1, Math.max(-2 * frame.height, Math.round(look.gazePx[1])));
  return validateSetup({
    display: { preset: look.display, ...(screen ? { viewingDistanceMm: look.distanceMm } : {}) },
    viewer: { ageYears: look.ageYears, refraction: { sphereD: look.sphereD }, pupilDiameterMm: look.pupilMm },
    light: { adaptingLuminanceCdM2: look.lightCdM2 },
    gaze: { xPx: gx, yPx: gy },
    frame: { placementPx, pixelRatio: s > 0 ? 1 / s : 1 },
  }, 'preview');
}

function verdictsOf(labels: readonly LabelVerdict[] | undefined): unknown[] {
  return (labels ?? []).map((v) => {
    const j = countedJudgement(v);
    return { id: v.id, boxPx: v.boxPx, letterHeightPx: v.letterHeightPx, verdict: v.verdict, limitedBy: j.limitedBy, fix: v.fix?.summary ?? '', eccentricityDeg: Math.round(v.fromGaze.eccentricityDeg * 10) / 10 };
  });
}

/** Host names this server answers to: its own address and the loopback names, with its port. */
function allowedHosts(host: string, port: number): Set<string> {
  const names = new Set([`${host}:${port}`, `127.0.0.1:${port}`, `localhost:${port}`, `[::1]:${port}`]);
  return names;
}

export async function startPreviewServer(options: PreviewOptions = {}): Promise<PreviewServer> {
  const host = options.host ?? '127.0.0.1';
  const sessions = new Map<string, Session>();
  let busy: Promise<unknown> = Promise.resolve();
  let hosts = new Set<string>();
  /** One computation at a time: requests wait their turn (the work is CPU-bound on this process). */
  const serial = <T>(work: () => Promise<T> | T): Promise<T> => {
    const next = busy.then(work, work);
    busy = next.catch(() => undefined);
    return next;
  };

  const handle = async (req: IncomingMessage, res: ServerResponse): Promise<void> => {
    // DNS rebinding: only our own Host, and no foreign Origin.
    const hostHeader = req.headers.host ?? '';
    if (!hosts.has(hostHeader)) throw new HttpError(403, 'this server answers only to its own address');
    const origin = req.headers.origin;
    if (origin !== undefined && !(origin.startsWith('http://') && hosts.has(origin.slice('http://'.length)))) throw new HttpError(403, 'requests from other sites are refused');
    const url = new URL(req.url ?? '/', 'http://preview.invalid');
    if (req.method === 'GET' && url.pathname === '/') return send(res, 200, 'text/html; charset=utf-8', PREVIEW_HTML);
    if (req.method === 'GET' && url.pathname === '/app.js') return send(res, 200, 'text/javascript; charset=utf-8', PREVIEW_JS);
    if (req.method === 'GET' && url.pathname === '/app.css') return send(res, 200, 'text/css; charset=utf-8', PREVIEW_CSS);
    if (req.method === 'GET' && url.pathname === '/api/displays') return json(res, 200, displayPresets.map((p) => ({ name: p.name, summary: p.summary, kind: p.values.kind, distanceMm: p.values.viewingDistanceMm ?? null })));
    if (req.method === 'POST' && url.pathname === '/api/frame') {
      const body = await readBody(req, res, MAX_FRAME_BYTES);
      const session = await serial(async () => {
        const full = await decodeFrame(body, 'the uploaded frame', [0, 0, 0], MAX_PREVIEW_PIXELS);
        // Text runs are found at full size; the preview works at most PREVIEW_WIDTH_PX wide.
        const found = detectTextRuns(linearToRgba8(full.image), full.image.width, full.image.height);
        const scale = Math.min(1, PREVIEW_WIDTH_PX / full.image.width);
        const image = scale < 1
          ? (await decodeFrame(await sharp(body).resize({ width: Math.round(full.image.width * scale), kernel: 'lanczos3' }).png().toBuffer(), 'the uploaded frame', [0, 0, 0], MAX_PREVIEW_PIXELS)).image
          : full.image;
        const k = image.width / full.image.width;
        const labels = found.map((l) => ({ ...l, boxPx: l.boxPx.map((v) => v * k) as [number, number, number, number], letterHeightPx: l.letterHeightPx * k }));
        const s: Session = { id: randomBytes(12).toString('hex'), frame: image, labels, used: Date.now(), fullSize: [full.image.width, full.image.height] };
        sessions.set(s.id, s);
        // At most MAX_SESSIONS frames in memory: the least recently used goes.
        while (sessions.size > MAX_SESSIONS) {
          const oldest = [...sessions.values()].sort((a, b) => a.used - b.used)[0];
          sessions.delete(oldest.id);
        }
        return s;
      });
      return json(res, 200, { frameId: session.id, width: session.frame.width, height: session.frame.height, fullSize: session.fullSize, labels: session.labels.length });
    }
    if (req.method === 'POST' && url.pathname === '/api/look') {
      const look = parseLook(await readBody(req, res, MAX_JSON_BYTES));
      const session = sessions.get(look.frameId);
      if (!session) throw new HttpError(404, 'no such frame (open it again)');
      const answer = await serial(async () => {
        const t0 = performance.now();
        session.used = Date.now();
        const setup = setupFor(look, session.frame);
        const key = JSON.stringify({ ...look, gazePx: undefined });
        let prepared = false;
        if (session.prepared?.key !== key) {
          session.prepared = undefined;
          session.last = undefined;
          session.prepared = { key, proof: prepareProof(session.frame, setup, 'preview') };
          prepared = true;
        }
        const gaze: [number, number] = [setup.gaze!.xPx, setup.gaze!.yPx];
        const result = lookAt(session.prepared.proof, { gazePx: gaze, labels: session.labels, ...(session.last ? { reuse: session.last } : {}) });
        session.last = result;
        const rgba = linearToRgba8(result.percept);
        const jpeg = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width: result.percept.width, height: result.percept.height, channels: 4 } }).removeAlpha().jpeg({ quality: 85 }).toBuffer();
        const n = result.numbers;
        return {
          percept: `data:image/jpeg;base64,${jpeg.toString('base64')}`,
          gazePx: gaze, prepared, ms: Math.round(performance.now() - t0),
          eye: { pupilMm: n.eye.pupilDiameterMm, defocusD: n.eye.defocusD, smallestLetterArcmin: n.eye.smallestLetterArcminAtGaze, pxPerDeg: n.display.framePixelsPerDegreeAtGaze },
          labels: verdictsOf(result.labels),
          caution: CAUTION_SHORT,
        };
      });
      return json(res, 200, answer);
    }
    throw new HttpError(404, 'not found');
  };

  const server = createServer((req, res) => {
    handle(req, res).catch((err: unknown) => {
      if (res.headersSent) {
        res.destroy();
        return;
      }
      if (err instanceof HttpError) return json(res, err.status, { error: err.message });
      if (err instanceof InputError || err instanceof ConfigError) return json(res, 422, { error: err.message });
      json(res, 500, { error: 'internal error' });
    });
  });
  server.headersTimeout = 15_000;
  server.requestTimeout = 60_000;
  server.maxHeadersCount = 50;
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  hosts = allowedHosts(host.includes(':') ? `[${host}]` : host, port);
  if (!['127.0.0.1', 'localhost', '::1'].includes(host)) {
    options.onWarning?.(`the preview is listening on ${host}:${port}, reachable from other machines; frames and settings sent to it are visible to anyone who can reach it. Use the default 127.0.0.1 unless you mean to share it.`);
  }
  return {
    url: `http://${host.includes(':') ? `[${host}]` : host}:${port}/`,
    server,
    close: () => new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections();
    }),
  };
}
