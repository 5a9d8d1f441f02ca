// A 3-D view of the venue's motion base at one instant of the run, scrubbed by the time slider or by
// the cursor on any chart. three.js is loaded only when this view is shown (it is large).
import { useEffect, useMemo, useRef, useState } from 'react';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { RunSeries } from '../../../../shared/schemas/run-series';
import { CHART_COLORS } from '../../../components/charts/palette';
import { Button } from '../../../components/ui/button';
import { ratioTone } from '../../../components/charts/run-badges';
import { poseAtBucket, previewJoints, previewLegLengths } from '../utils/preview-geometry';
import { centroidOf, pointAt } from '../../../lib/scene-points';
import type { PreviewPose, ThreeModule } from '../utils/preview-geometry';

/** What a frame shows, stamped on the view's element as it is drawn (for readers of the markup and tests). */
export interface ShownInstant {
  /** Motion time (s) of the bucket drawn. */
  t_s: number;
  pose: PreviewPose;
}

interface Scene {
  show: (
    joints: { base: Float64Array; platform: Float64Array; seats: Float64Array; seatFeet: Float64Array },
    /** Each leg's stroke use: 0 at mid-stroke, 1 at a margin (the budget's measure). */
    legUse: readonly number[],
    instant: ShownInstant,
  ) => void;
  /** Turns the view about the platform: azimuth about the vertical, then elevation (rad). */
  turn: (azimuth_rad: number, elevation_rad: number) => void;
  dispose: () => void;
}

function webglAvailable(): boolean {
  try {
    const canvas = document.createElement('canvas');
    return !!canvas.getContext('webgl2');
  } catch {
    return false;
  }
}

async function buildScene(three: ThreeModule, el: HTMLElement, base: MotionBase): Promise<Scene> {
  const [{ OrbitControls }, { LineSegments2 }, { LineSegmentsGeometry }, { LineMaterial }] =
    await Promise.all([
      import('three/examples/jsm/controls/OrbitControls.js'),
      import('three/examples/jsm/lines/LineSegments2.js'),
      import('three/examples/jsm/lines/LineSegmentsGeometry.js'),
      import('three/examples/jsm/lines/LineMaterial.js'),
    ]);
  const width_px = Math.max(el.clientWidth, 240);
  const height_px = 320;
  const renderer = new three.WebGLRenderer({ antialias: true });
  renderer.setPixelRatio(window.devicePixelRatio);
  renderer.setSize(width_px, height_px);
  renderer.setClearColor(0xffffff);
  el.appendChild(renderer.domElement);

  const hexapod = base.kind === 'hexapod';
  const height_m = hexapod ? base.neutralHeight_m : 0;
  const camera = new three.PerspectiveCamera(35, width_px / height_px, 0.05, 100);
  // z is up in every Legwork frame (docs/motion-conventions.md section 1).
  camera.up.set(0, 0, 1);
  camera.position.set(hexapod ? 4.2 : 2.5, hexapod ? -4.2 : -3.5, hexapod ? 3.2 : 5);
  const target = new three.Vector3(0, 0, height_m * 0.5);
  camera.lookAt(target);

  const scene = new three.Scene();
  const grid = new three.GridHelper(5, 10, 0xc5cfd9, 0xe3e8ee);
  grid.rotation.x = Math.PI / 2;
  scene.add(grid);
  scene.add(new three.AxesHelper(0.5));

  const n = base.baseJoints_m.length;
  const loop = (color: string) => {
    const geometry = new three.BufferGeometry();
    geometry.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(3 * n), 3));
    const line = new three.LineLoop(geometry, new three.LineBasicMaterial({ color }));
    scene.add(line);
    return geometry;
  };
  const baseLoop = loop(CHART_COLORS.input);
  const platformLoop = loop(CHART_COLORS.axis);
  const legGeometry = new three.BufferGeometry();
  legGeometry.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(6 * n), 3));
  legGeometry.setAttribute('color', new three.Float32BufferAttribute(new Float32Array(6 * n), 3));
  // The legs drawn 3 px wide (WebGL's own lines are 1 px), so their stroke-use colour reads.
  const wideLegs = new LineSegmentsGeometry();
  const legMaterial = new LineMaterial({ vertexColors: true, linewidth: 3 });
  scene.add(new LineSegments2(wideLegs, legMaterial));
  // The seats (rider reference points) as dots riding on the platform.
  const seatCount = base.seats_m.length;
  const seatGeometry = new three.BufferGeometry();
  seatGeometry.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(3 * seatCount), 3));
  scene.add(
    new three.Points(
      seatGeometry,
      new three.PointsMaterial({ color: CHART_COLORS.seat, size: 7, sizeAttenuation: false }),
    ),
  );
  // A post from the deck up to each seat, so the seats read as carried by the platform.
  const postGeometry = new three.BufferGeometry();
  postGeometry.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(6 * seatCount), 3));
  scene.add(new three.LineSegments(postGeometry, new three.LineBasicMaterial({ color: CHART_COLORS.seat })));

  // Legs in the one use scale of the app: within, near (from 0.8) and over the limit.
  const toneColor = {
    ok: new three.Color(CHART_COLORS.cued),
    close: new three.Color(CHART_COLORS.comfort),
    over: new three.Color(CHART_COLORS.hard),
  };
  const controls = new OrbitControls(camera, renderer.domElement);
  controls.target.copy(target);
  controls.update();
  const up = new three.Vector3(0, 0, 1);
  // Every frame drawn writes what it shows onto the holder: the instant and pose, the platform's
  // centroid as placed in the scene, and the camera's bearing. Written here, after the draw call, so
  // the attributes always describe the picture on the canvas.
  let frames = 0;
  let shown: { instant: ShownInstant; platformCentroid_m: [number, number, number] } | null = null;
  const render = () => {
    renderer.render(scene, camera);
    frames++;
    const offset = camera.position.clone().sub(controls.target);
    const azimuth_deg = ((((Math.atan2(offset.y, offset.x) * 180) / Math.PI) % 360) + 360) % 360;
    const elevation_deg = 90 - (offset.angleTo(up) * 180) / Math.PI;
    const d = el.dataset;
    d.frames = String(frames);
    d.cameraAzimuthDeg = azimuth_deg.toFixed(3);
    d.cameraElevationDeg = elevation_deg.toFixed(3);
    if (shown) {
      const { pose, t_s } = shown.instant;
      d.poseT = String(t_s);
      d.poseSurgeMm = (pose.x_m * 1000).toFixed(3);
      d.poseSwayMm = (pose.y_m * 1000).toFixed(3);
      d.poseHeaveMm = (pose.z_m * 1000).toFixed(3);
      d.poseRollDeg = ((pose.roll_rad * 180) / Math.PI).toFixed(4);
      d.posePitchDeg = ((pose.pitch_rad * 180) / Math.PI).toFixed(4);
      d.poseYawDeg = ((pose.yaw_rad * 180) / Math.PI).toFixed(4);
      d.platformCentroidMm = shown.platformCentroid_m.map((v) => (v * 1000).toFixed(3)).join(' ');
    }
  };
  controls.addEventListener('change', render);
  const turn = (azimuth_rad: number, elevation_rad: number) => {
    const offset = camera.position.clone().sub(controls.target);
    offset.applyAxisAngle(up, azimuth_rad);
    const side = offset.clone().cross(up).normalize();
    const tilted = offset.clone().applyAxisAngle(side, elevation_rad);
    // Never over the top or under the floor: keep 5 deg off the vertical.
    const fromUp = tilted.angleTo(up);
    if (fromUp > (5 * Math.PI) / 180 && fromUp < (175 * Math.PI) / 180) offset.copy(tilted);
    camera.position.copy(controls.target).add(offset);
    camera.lookAt(controls.target);
    controls.update();
    render();
  };
  // Turnable by keyboard as well as by mouse: the canvas takes focus; arrow keys turn 5 deg a press.
  const canvas = renderer.domElement;
  canvas.tabIndex = 0;
  canvas.setAttribute('role', 'img');
  canvas.setAttribute(
    'aria-label',
    'Motion base in 3-D: drag, or focus and use the arrow keys, to turn the view',
  );
  const step_rad = (5 * Math.PI) / 180;
  const onKey = (event: KeyboardEvent) => {
    const turns: Record<string, [number, number]> = {
      ArrowLeft: [-step_rad, 0],
      ArrowRight: [step_rad, 0],
      // Up looks from higher, down from lower.
      ArrowUp: [0, step_rad],
      ArrowDown: [0, -step_rad],
    };
    const t = turns[event.key];
    if (!t) return;
    event.preventDefault();
    turn(t[0], t[1]);
  };
  canvas.addEventListener('keydown', onKey);

  const observer =
    typeof ResizeObserver === 'undefined'
      ? null
      : new ResizeObserver(() => {
          const w = Math.max(el.clientWidth, 240);
          renderer.setSize(w, height_px);
          camera.aspect = w / height_px;
          camera.updateProjectionMatrix();
          render();
        });
  observer?.observe(el);

  return {
    show: (joints, legUse, instant) => {
      const bp = baseLoop.getAttribute('position') as InstanceType<ThreeModule['BufferAttribute']>;
      const pp = platformLoop.getAttribute('position') as InstanceType<ThreeModule['BufferAttribute']>;
      const lp = legGeometry.getAttribute('position') as InstanceType<ThreeModule['BufferAttribute']>;
      const lc = legGeometry.getAttribute('color') as InstanceType<ThreeModule['BufferAttribute']>;
      for (let i = 0; i < n; i++) {
        const b = pointAt(joints.base, i);
        const p = pointAt(joints.platform, i);
        bp.setXYZ(i, b[0], b[1], b[2]);
        pp.setXYZ(i, p[0], p[1], p[2]);
        lp.setXYZ(2 * i, b[0], b[1], b[2]);
        lp.setXYZ(2 * i + 1, p[0], p[1], p[2]);
        const c = toneColor[ratioTone(legUse[i] ?? 0)];
        lc.setXYZ(2 * i, c.r, c.g, c.b);
        lc.setXYZ(2 * i + 1, c.r, c.g, c.b);
      }
      const sp = seatGeometry.getAttribute('position') as InstanceType<ThreeModule['BufferAttribute']>;
      const post = postGeometry.getAttribute('position') as InstanceType<ThreeModule['BufferAttribute']>;
      for (let k = 0; k < seatCount; k++) {
        const seat = pointAt(joints.seats, k);
        sp.setXYZ(k, ...seat);
        post.setXYZ(2 * k, ...pointAt(joints.seatFeet, k));
        post.setXYZ(2 * k + 1, ...seat);
      }
      sp.needsUpdate = true;
      post.needsUpdate = true;
      bp.needsUpdate = true;
      pp.needsUpdate = true;
      lp.needsUpdate = true;
      lc.needsUpdate = true;
      wideLegs.setPositions(lp.array as Float32Array);
      wideLegs.setColors(lc.array as Float32Array);
      // The centroid of the platform joints as they now stand in the scene's buffer.
      shown = { instant, platformCentroid_m: centroidOf(pp, n) };
      el.dataset.legUse = Array.from(legUse, (u) => u.toFixed(3)).join(' ');
      render();
    },
    turn,
    dispose: () => {
      canvas.removeEventListener('keydown', onKey);
      observer?.disconnect();
      controls.dispose();
      wideLegs.dispose();
      legMaterial.dispose();
      renderer.dispose();
      renderer.domElement.remove();
    },
  };
}

/** A take's proxy video and where the motion sits on it. */
export interface ProxyVideoClip {
  url: string;
  /** Picture time at motion time 0 (s): the film sync offset. */
  offset_s: number;
}

const SPEEDS = [0.25, 0.5, 1, 2] as const;
const LEG_TONE_TEXT = {
  ok: 'text-ink-800',
  close: 'text-signal-600',
  over: 'font-semibold text-stop-700',
} as const;

/**
 * The motion base at bucket `index` of the run: legs outside the stroke band are drawn red. Plays at
 * a chosen speed; a take's proxy video, when there is one, plays and seeks in step with it.
 */
export function BasePreview({
  base,
  series,
  index,
  onIndex,
  video = null,
}: {
  base: MotionBase;
  series: RunSeries;
  index: number;
  onIndex: (index: number) => void;
  video?: ProxyVideoClip | null;
}) {
  const [speed, setSpeed] = useState<number>(1);
  const film = useRef<HTMLVideoElement>(null);
  const holder = useRef<HTMLDivElement>(null);
  const scene = useRef<Scene | null>(null);
  const [three, setThree] = useState<ThreeModule | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [playing, setPlaying] = useState(false);
  const last = Math.max(series.time_s.length - 1, 0);
  const at = Math.min(Math.max(index, 0), last);

  useEffect(() => {
    const el = holder.current;
    if (!el) return;
    let cancelled = false;
    let built: Scene | null = null;
    (async () => {
      if (!webglAvailable()) {
        setProblem(
          'This browser offers no WebGL, so the 3-D preview is off; the charts hold the same motion.',
        );
        return;
      }
      // three.js is large: fetch and parse it once the charts are drawn and the browser is idle, so
      // the run page's numbers come first.
      await new Promise<void>((resolve) => {
        if ('requestIdleCallback' in window) window.requestIdleCallback(() => resolve(), { timeout: 1500 });
        else setTimeout(resolve, 300);
      });
      if (cancelled) return;
      const module = await import('three');
      if (cancelled) return;
      built = await buildScene(module, el, base);
      if (cancelled) {
        built.dispose();
        return;
      }
      scene.current = built;
      setThree(module);
    })().catch((error: unknown) => {
      if (!cancelled)
        setProblem(
          `The 3-D preview could not start: ${error instanceof Error ? error.message : String(error)}`,
        );
    });
    return () => {
      cancelled = true;
      built?.dispose();
      scene.current = null;
    };
  }, [base]);

  const { min_m, max_m, margin_m } = series.stroke;
  const lowest_m = min_m + margin_m;
  const highest_m = max_m - margin_m;
  const pose = useMemo(() => poseAtBucket(series, at), [series, at]);
  const joints = useMemo(() => (three ? previewJoints(three, base, pose) : null), [three, base, pose]);
  const legs = useMemo(() => (joints ? previewLegLengths(joints) : null), [joints]);
  const mid_m = series.stroke.mid_m;
  // Stroke use as the budget measures it: 0 at mid-stroke, 1 at the margin on that side.
  const legUse = useMemo(
    () =>
      legs
        ? Array.from(legs, (l) =>
            l >= mid_m
              ? (l - mid_m) / Math.max(highest_m - mid_m, 1e-9)
              : (mid_m - l) / Math.max(mid_m - lowest_m, 1e-9),
          )
        : [],
    [legs, lowest_m, highest_m, mid_m],
  );

  const shownAt_s = series.time_s[at] ?? 0;
  useEffect(() => {
    if (joints) scene.current?.show(joints, legUse, { t_s: shownAt_s, pose });
  }, [joints, legUse, shownAt_s, pose]);

  // Plays the run in real time from the current instant; stops at the end.
  useEffect(() => {
    if (!playing) return;
    const times = series.time_s;
    const start_s = times[at] ?? 0;
    const startedAt = performance.now();
    let frame = 0;
    let k = at;
    const clip = film.current;
    if (clip && video) {
      clip.playbackRate = speed;
      clip.currentTime = Math.max(0, start_s + video.offset_s);
      void clip.play().catch(() => undefined);
    }
    const step = (now: number) => {
      const t = start_s + ((now - startedAt) / 1000) * speed;
      // The motion's clock leads; the picture is pulled back in line when it drifts by 0.1 s.
      if (clip && video && Math.abs(clip.currentTime - (t + video.offset_s)) > 0.1) {
        clip.currentTime = Math.max(0, t + video.offset_s);
      }
      while (k < last && (times[k + 1] ?? Infinity) <= t) k++;
      onIndex(k);
      if (k >= last) setPlaying(false);
      else frame = requestAnimationFrame(step);
    };
    frame = requestAnimationFrame(step);
    return () => {
      cancelAnimationFrame(frame);
      clip?.pause();
    };
    // Restart only when play is pressed, not on every index it sets itself.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [playing]);

  const time_s = series.time_s[at] ?? 0;
  // Scrubbing (a chart's cursor, the slider) moves the picture to the same instant.
  useEffect(() => {
    const clip = film.current;
    if (!clip || !video || playing) return;
    clip.currentTime = Math.max(0, time_s + video.offset_s);
  }, [time_s, video, playing]);
  return (
    <div className="flex flex-col gap-2" data-testid="base-preview">
      <div ref={holder} className="min-h-20 rounded border border-ink-100" data-testid="base-view" />
      {video ? (
        <video
          ref={film}
          src={video.url}
          muted
          playsInline
          preload="auto"
          aria-label="Proxy of the ride film, in step with the motion"
          className="w-full max-w-xl rounded border border-ink-100 bg-ink-900"
        />
      ) : null}
      {problem ? <p className="text-xs text-ink-600">{problem}</p> : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button size="sm" onClick={() => setPlaying(!playing)} disabled={!three}>
          {playing ? 'Pause' : 'Play'}
        </Button>
        <label className="flex items-center gap-1 text-xs text-ink-600">
          Speed
          <select
            value={speed}
            onChange={(event) => {
              setPlaying(false);
              setSpeed(Number(event.target.value));
            }}
            className="rounded border border-ink-200 bg-white px-1 py-0.5 text-xs text-ink-900"
          >
            {SPEEDS.map((s) => (
              <option key={s} value={s}>
                {s} x
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-1 items-center gap-2 text-xs text-ink-600">
          Time
          <input
            type="range"
            min={0}
            max={last}
            value={at}
            onChange={(event) => {
              setPlaying(false);
              onIndex(Number(event.target.value));
            }}
            className="flex-1 accent-tealdeep-600"
          />
          <span className="w-16 text-right font-mono text-ink-900">{time_s.toFixed(2)} s</span>
        </label>
      </div>
      {legs ? (
        <ul
          className="flex flex-wrap gap-x-4 gap-y-1 font-mono text-xs"
          aria-label="Leg lengths at this instant"
        >
          {Array.from(legs, (l, i) => (
            <li key={i} className={LEG_TONE_TEXT[ratioTone(legUse[i] ?? 0)]}>
              leg{i + 1} {l.toFixed(3)} m{' '}
              <span className="text-ink-600">use {(legUse[i] ?? 0).toFixed(2)}</span>
            </li>
          ))}
          <li className="text-ink-400">
            band {lowest_m.toFixed(3)}–{highest_m.toFixed(3)} m
          </li>
        </ul>
      ) : null}
      <p className="text-xs text-ink-400">
        Base grey, platform dark, seats as violet dots on posts from the deck; legs coloured by stroke use:
        teal within, amber from 0.8, red at or past a margin. Pose from the middle of each chart bucket; drag,
        or use the arrow keys on the view, to turn it. Hover a chart to move the time.
      </p>
    </div>
  );
}
