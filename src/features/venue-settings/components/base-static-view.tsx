// A 3-D view of the motion base being edited, at neutral or at one extreme of its workspace. The joint
// positions come from `placeJoints` (the run preview's geometry, computed with three.js's own matrices,
// handed in by the page so this feature does not reach into another). three.js loads only when shown.
import { useEffect, useRef, useState } from 'react';
import type * as Three from 'three';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import { CHART_COLORS } from '../../../components/charts/palette';
import { centroidOf, pointAt } from '../../../lib/scene-points';

type ThreeModule = typeof Three;

/** A pose offset from neutral (m, rad). */
export interface ViewPose {
  x_m: number;
  y_m: number;
  z_m: number;
  roll_rad: number;
  pitch_rad: number;
  yaw_rad: number;
}

export const NEUTRAL_POSE: ViewPose = { x_m: 0, y_m: 0, z_m: 0, roll_rad: 0, pitch_rad: 0, yaw_rad: 0 };

/** Base and platform joints in the base frame (m), flattened xyz per joint, for a pose offset. */
export type PlaceJoints = (
  three: ThreeModule,
  base: MotionBase,
  pose: ViewPose,
) => { base: Float64Array; platform: Float64Array };

interface Scene {
  show: (joints: { base: Float64Array; platform: Float64Array }, legOk: readonly boolean[]) => void;
  dispose: () => void;
}

const HEIGHT_PX = 280;

function buildScene(three: ThreeModule, el: HTMLElement, n: number, hexapod: boolean): Scene {
  const width_px = Math.max(el.clientWidth, 240);
  const renderer = new three.WebGLRenderer({ antialias: true });
  renderer.setPixelRatio(window.devicePixelRatio);
  renderer.setSize(width_px, HEIGHT_PX);
  renderer.setClearColor(0xffffff);
  el.appendChild(renderer.domElement);
  const camera = new three.PerspectiveCamera(35, width_px / HEIGHT_PX, 0.05, 100);
  // z is up in every Legwork frame (docs/motion-conventions.md section 1).
  camera.up.set(0, 0, 1);
  camera.position.set(hexapod ? 4.6 : 2.5, hexapod ? -4.6 : -3.5, hexapod ? 3.4 : 5);
  camera.lookAt(new three.Vector3(0, 0, hexapod ? 0.8 : 0));
  const scene = new three.Scene();
  const grid = new three.GridHelper(5, 10, 0xc5cfd9, 0xe3e8ee);
  grid.rotation.x = Math.PI / 2;
  scene.add(grid);
  scene.add(new three.AxesHelper(0.5));
  const loop = (color: string) => {
    const geometry = new three.BufferGeometry();
    geometry.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(3 * n), 3));
    scene.add(new three.LineLoop(geometry, new three.LineBasicMaterial({ color })));
    return geometry;
  };
  const baseLoop = loop(CHART_COLORS.input);
  const platformLoop = loop(CHART_COLORS.cued);
  const legs = new three.BufferGeometry();
  legs.setAttribute('position', new three.Float32BufferAttribute(new Float32Array(6 * n), 3));
  legs.setAttribute('color', new three.Float32BufferAttribute(new Float32Array(6 * n), 3));
  scene.add(new three.LineSegments(legs, new three.LineBasicMaterial({ vertexColors: true })));
  const okColor = new three.Color(CHART_COLORS.axis);
  const badColor = new three.Color(CHART_COLORS.hard);
  type Attr = InstanceType<ThreeModule['BufferAttribute']>;
  let frames = 0;
  return {
    show: (joints, legOk) => {
      const bp = baseLoop.getAttribute('position') as Attr;
      const pp = platformLoop.getAttribute('position') as Attr;
      const lp = legs.getAttribute('position') as Attr;
      const lc = legs.getAttribute('color') as Attr;
      for (let i = 0; i < n; i++) {
        const b = pointAt(joints.base, i);
        const p = pointAt(joints.platform, i);
        bp.setXYZ(i, ...b);
        pp.setXYZ(i, ...p);
        lp.setXYZ(2 * i, ...b);
        lp.setXYZ(2 * i + 1, ...p);
        const c = legOk[i] === false ? badColor : okColor;
        lc.setXYZ(2 * i, c.r, c.g, c.b);
        lc.setXYZ(2 * i + 1, c.r, c.g, c.b);
      }
      for (const a of [bp, pp, lp, lc]) a.needsUpdate = true;
      renderer.render(scene, camera);
      // What the frame drawn shows, on the holder: a count of frames and the platform's centroid as
      // placed in the scene (mm, base frame), for readers of the markup and for tests.
      frames++;
      el.dataset.frames = String(frames);
      el.dataset.platformCentroidMm = centroidOf(pp, n)
        .map((v) => (v * 1000).toFixed(3))
        .join(' ');
    },
    dispose: () => {
      renderer.dispose();
      renderer.forceContextLoss();
      renderer.domElement.remove();
    },
  };
}

function webglAvailable(): boolean {
  try {
    return !!document.createElement('canvas').getContext('webgl2');
  } catch {
    return false;
  }
}

/** The base at `pose` (neutral by default); legs outside [leg.min_m, leg.max_m] are drawn in the hard-limit colour. */
export function BaseStaticView({
  base,
  pose = NEUTRAL_POSE,
  placeJoints,
  caption,
  stale = false,
}: {
  base: MotionBase | null;
  /** The base shown is not the form's current one (it has problems): the view says so. */
  stale?: boolean;
  pose?: ViewPose;
  placeJoints: PlaceJoints;
  caption: string;
}) {
  const holder = useRef<HTMLDivElement>(null);
  const scene = useRef<Scene | null>(null);
  const [three, setThree] = useState<ThreeModule | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const kind = base?.kind ?? null;
  const n = base?.baseJoints_m.length ?? 0;

  const [webgl] = useState(webglAvailable);
  useEffect(() => {
    if (!webgl) return;
    let cancelled = false;
    import('three')
      .then((module) => {
        if (!cancelled) setThree(module);
      })
      .catch((error: unknown) => {
        if (!cancelled)
          setProblem(
            `The 3-D view could not start: ${error instanceof Error ? error.message : String(error)}`,
          );
      });
    return () => {
      cancelled = true;
    };
  }, [webgl]);

  // One scene per kind of base (the number of joints); edits only move its points.
  useEffect(() => {
    const el = holder.current;
    if (!three || !el || !kind) return;
    const built = buildScene(three, el, n, kind === 'hexapod');
    scene.current = built;
    return () => {
      built.dispose();
      scene.current = null;
    };
  }, [three, kind, n]);

  useEffect(() => {
    if (!three || !base || !scene.current) return;
    const joints = placeJoints(three, base, pose);
    const legOk: boolean[] = [];
    for (let i = 0; i < n; i++) {
      const d = Math.hypot(
        (joints.platform[3 * i] ?? 0) - (joints.base[3 * i] ?? 0),
        (joints.platform[3 * i + 1] ?? 0) - (joints.base[3 * i + 1] ?? 0),
        (joints.platform[3 * i + 2] ?? 0) - (joints.base[3 * i + 2] ?? 0),
      );
      // A leg exactly at its limit (a workspace extreme) is within; 1 um for rounding.
      legOk.push(d >= base.leg.min_m - 1e-6 && d <= base.leg.max_m + 1e-6);
    }
    scene.current.show(joints, legOk);
  }, [three, base, pose, placeJoints, n]);

  return (
    <figure
      className="flex flex-col gap-1"
      data-testid="base-static-view"
      data-shows={!base ? 'nothing' : stale ? 'last-valid' : 'current'}
    >
      <div
        ref={holder}
        data-testid="base-static-canvas"
        className={`min-h-20 rounded border ${stale ? 'border-dashed border-signal-400 opacity-70' : 'border-ink-100'}`}
      />
      {!webgl ? (
        <p className="text-xs text-ink-600">
          This browser offers no WebGL, so the 3-D view is off; the fields hold the same geometry.
        </p>
      ) : null}
      {problem ? <p className="text-xs text-ink-600">{problem}</p> : null}
      {!base ? <p className="text-xs text-ink-600">The view waits for a base without problems.</p> : null}
      <figcaption className="text-xs text-ink-400">{caption}</figcaption>
    </figure>
  );
}
