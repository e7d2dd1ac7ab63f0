"use client";
import { Edges, Grid, OrbitControls } from "@react-three/drei";
import { Canvas, useFrame, useThree } from "@react-three/fiber";
import { memo, useEffect, useLayoutEffect, useMemo, useRef } from "react";
import * as THREE from "three";
import { Line2 } from "three/examples/jsm/lines/Line2.js";
import { LineGeometry } from "three/examples/jsm/lines/LineGeometry.js";
import { LineMaterial } from "three/examples/jsm/lines/LineMaterial.js";
import {
  type ArmChain,
  type Finding,
  type KeepOutBox,
  compileChain,
  createChainBuffers,
  forwardKinematics,
  linkFrames,
  type CompiledChain,
  type Joint,
  sampleTimeline,
  type Timeline,
} from "@/kinematics";
import { usePlayheadStore, type Playhead } from "@/components/editor/playhead";
import { linkShapes, ShapeMesh } from "./arm-mesh";
import { ghostColors, keepOutColors, severityColors, toolPathColor } from "./colors";
import { touchedKeepOut } from "./keep-out";
import { webglInSoftware } from "./error-boundary";
import { createPoseScratch, poseAt } from "./pose-at";

export interface StageProps {
  chain: ArmChain;
  joints: readonly Joint[];
  timeline: Timeline;
  /** Start pose and the selected move's goal, drawn as translucent ghosts. */
  ghosts: { pose: readonly number[]; label: "start" | "goal" }[];
  /** Per move, per link (0 = base): the worst severity of the findings of the joint that drives it. */
  linkSeverity: readonly (readonly ("caution" | "fault" | null)[])[];
  keepOut?: readonly KeepOutBox[];
  /** The plan's findings: a keep-out box a clearance finding names is drawn in the fault colour, the rest neutral. */
  findings?: readonly Finding[];
  /** Set while the page waits for a changed plan's figures: playhead moves are drawn when it is cleared. */
  hold?: boolean;
}

const LINK_COLOR = new THREE.Color("#d6d2c8");
const BASE_COLOR = new THREE.Color("#5b6472");
const SEVERITY_COLOR = {
  fault: new THREE.Color(severityColors.fault),
  caution: new THREE.Color(severityColors.caution),
};

function useCompiled(chain: ArmChain, joints: readonly Joint[]): CompiledChain {
  return useMemo(
    () =>
      compileChain(
        chain,
        joints.map((j) => j.type),
      ),
    [chain, joints],
  );
}

/**
 * Re-renders the canvas (frameloop "demand") whenever the playhead moves. A new plan length alone
 * (an edit of a duration) draws nothing: without a GPU a frame costs the page tens of milliseconds.
 * The frame is asked for in the next animation frame, and not while `hold` is set (the plan has
 * changed and the view waits for its figures): a seek that comes with an edit (a new move selected)
 * is then drawn once, with the new plan, when the hold is released.
 */
function Invalidator({ playhead, hold }: { playhead: Playhead; hold: boolean }) {
  const invalidate = useThree((s) => s.invalidate);
  const held = useRef(hold);
  const owed = useRef(false);
  useLayoutEffect(() => {
    held.current = hold;
    if (!hold && owed.current) {
      owed.current = false;
      invalidate();
    }
  }, [hold, invalidate]);
  useEffect(() => {
    let shown = playhead.get().timeS;
    let frame = 0;
    const unsubscribe = playhead.subscribe(() => {
      const { timeS } = playhead.get();
      if (timeS === shown) return;
      shown = timeS;
      if (frame) return;
      // by the next frame the page has rendered the input that moved the playhead, and set `hold`
      frame = requestAnimationFrame(() => {
        frame = 0;
        if (held.current) owed.current = true;
        else invalidate();
      });
    });
    return () => {
      unsubscribe();
      cancelAnimationFrame(frame);
    };
  }, [playhead, invalidate]);
  return null;
}

/** The arm at the playhead: link frames from forward kinematics every frame, no allocation per frame. */
function AnimatedArm({
  chain,
  compiled,
  timeline,
  linkSeverity,
  playhead,
  software,
}: {
  chain: ArmChain;
  compiled: CompiledChain;
  timeline: Timeline;
  linkSeverity: StageProps["linkSeverity"];
  playhead: Playhead;
  /** Drawn in software: Lambert shading, far cheaper per pixel than the physically based one. */
  software: boolean;
}) {
  const linkCount = compiled.jointCount + 1;
  const groups = useRef<(THREE.Group | null)[]>([]);
  const tip = useRef<THREE.Mesh>(null);
  const materials = useMemo(
    () =>
      Array.from({ length: linkCount }, (_, i) =>
        software
          ? new THREE.MeshLambertMaterial({ color: i === 0 ? BASE_COLOR : LINK_COLOR })
          : new THREE.MeshStandardMaterial({
              color: i === 0 ? BASE_COLOR : LINK_COLOR,
              roughness: 0.55,
              metalness: 0.1,
            }),
      ),
    [linkCount, software],
  );
  const work = useMemo(
    () => ({
      pose: new Float64Array(timeline.jointCount),
      scratch: createPoseScratch(timeline.jointCount),
      buffers: createChainBuffers(compiled),
    }),
    [timeline, compiled],
  );
  // The move whose highlight colours are on the materials; reset when the findings change.
  const shownMove = useRef(-2);
  useEffect(() => {
    shownMove.current = -2;
  }, [linkSeverity, materials]);

  useEffect(() => () => materials.forEach((m) => m.dispose()), [materials]);
  // a new timeline moves the arm at the same playhead time: draw it
  const invalidate = useThree((s) => s.invalidate);
  useEffect(() => invalidate(), [timeline, linkSeverity, invalidate]);

  useFrame(() => {
    const move = poseAt(timeline, playhead.get().timeS, work.pose, work.scratch);
    forwardKinematics(compiled, work.pose, work.buffers);
    const frames = work.buffers.frames;
    for (let i = 0; i < linkCount; i++) {
      const g = groups.current[i];
      if (!g) continue;
      g.matrix.fromArray(frames, 16 * i);
      g.matrixWorldNeedsUpdate = true;
    }
    if (tip.current) tip.current.position.set(work.buffers.tool[12], work.buffers.tool[13], work.buffers.tool[14]);
    if (move !== shownMove.current) {
      shownMove.current = move;
      const sev = move >= 0 && move < linkSeverity.length ? linkSeverity[move] : null;
      materials.forEach((m, i) => {
        const s = sev?.[i];
        m.color.copy(s ? SEVERITY_COLOR[s] : i === 0 ? BASE_COLOR : LINK_COLOR);
      });
    }
  });

  return (
    <group name="arm">
      {Array.from({ length: linkCount }, (_, i) => (
        <group
          key={i}
          ref={(g) => {
            groups.current[i] = g;
          }}
          matrixAutoUpdate={false}
        >
          {linkShapes(chain, i).map((shape, k) => (
            <ShapeMesh key={k} shape={shape} material={materials[i]} />
          ))}
        </group>
      ))}
      <mesh ref={tip}>
        <sphereGeometry args={[0.012, 16, 12]} />
        <meshBasicMaterial color={toolPathColor} />
      </mesh>
    </group>
  );
}

/** A translucent copy of the arm at a fixed pose. */
function GhostArm({
  chain,
  compiled,
  pose,
  color,
}: {
  chain: ArmChain;
  compiled: CompiledChain;
  pose: readonly number[];
  color: string;
}) {
  const linkCount = compiled.jointCount + 1;
  const groups = useRef<(THREE.Group | null)[]>([]);
  const material = useMemo(
    () => new THREE.MeshBasicMaterial({ color, transparent: true, opacity: 0.16, depthWrite: false }),
    [color],
  );
  useEffect(() => () => material.dispose(), [material]);
  useLayoutEffect(() => {
    const frames = linkFrames(compiled, pose, new Float64Array(16 * linkCount));
    for (let i = 0; i < linkCount; i++) {
      const g = groups.current[i];
      if (!g) continue;
      g.matrix.fromArray(frames, 16 * i);
      g.matrixWorldNeedsUpdate = true;
    }
  }, [compiled, pose, linkCount]);
  return (
    <group>
      {Array.from({ length: linkCount }, (_, i) => (
        <group
          key={i}
          ref={(g) => {
            groups.current[i] = g;
          }}
          matrixAutoUpdate={false}
        >
          {linkShapes(chain, i).map((shape, k) => (
            <ShapeMesh key={k} shape={shape} material={material} />
          ))}
        </group>
      ))}
    </group>
  );
}

/**
 * The tool point's path over the whole plan, sampled at up to 100 Hz, as a 2 px line. Its material
 * lives as long as the view: a line component that disposes its material with each new path makes
 * the renderer compile the line's shaders again on every edit (tens of milliseconds without a GPU).
 */
function ToolPath({ compiled, timeline }: { compiled: CompiledChain; timeline: Timeline }) {
  const size = useThree((s) => s.size);
  const material = useMemo(() => new LineMaterial({ color: toolPathColor, linewidth: 2 }), []);
  useEffect(() => () => material.dispose(), [material]);
  useLayoutEffect(() => {
    material.resolution.set(size.width, size.height);
  }, [material, size]);
  const line = useMemo(() => {
    const rate = timeline.totalS > 0 ? Math.min(100, 3000 / timeline.totalS) : 1;
    const s = sampleTimeline(timeline, rate);
    if (s.count < 2) return null;
    const buffers = createChainBuffers(compiled);
    const positions = new Float32Array(3 * s.count);
    for (let k = 0; k < s.count; k++) {
      const t = forwardKinematics(compiled, s.position, buffers, k * s.jointCount);
      positions.set([t[12], t[13], t[14]], 3 * k);
    }
    const geometry = new LineGeometry();
    geometry.setPositions(positions);
    return new Line2(geometry, material);
  }, [compiled, timeline, material]);
  useEffect(() => () => line?.geometry.dispose(), [line]);
  return line ? <primitive object={line} /> : null;
}

function KeepOut({ box, touched }: { box: KeepOutBox; touched: boolean }) {
  const look = touched ? keepOutColors.touched : keepOutColors.neutral;
  const size: [number, number, number] = [box.max[0] - box.min[0], box.max[1] - box.min[1], box.max[2] - box.min[2]];
  const center: [number, number, number] = [
    (box.max[0] + box.min[0]) / 2,
    (box.max[1] + box.min[1]) / 2,
    (box.max[2] + box.min[2]) / 2,
  ];
  return (
    <mesh position={center}>
      <boxGeometry args={size} />
      <meshBasicMaterial color={look.fill} transparent opacity={look.opacity} depthWrite={false} />
      <Edges color={look.edge} />
    </mesh>
  );
}

/**
 * The work surface (z = 0 in the arm's base frame) with a 5 cm grid. Drawn in software, the surface is
 * unlit and the grid is plain lines: the shaded plane and the grid's shader cover most of the view, and
 * without a GPU every pixel of them costs the page's thread.
 */
function WorkSurface({ software }: { software: boolean }) {
  const lines = useMemo(() => (software ? surfaceGridLines() : null), [software]);
  useEffect(
    () => () =>
      lines?.forEach((l) => {
        l.geometry.dispose();
        (l.material as THREE.Material).dispose();
      }),
    [lines],
  );
  if (lines) {
    return (
      <group>
        <mesh position={[0, 0, -0.0015]}>
          <planeGeometry args={[1.6, 1.6]} />
          <meshBasicMaterial color="#ebe7dc" />
        </mesh>
        {lines.map((l, i) => (
          <primitive key={i} object={l} />
        ))}
      </group>
    );
  }
  return (
    <group>
      <mesh position={[0, 0, -0.0015]} receiveShadow>
        <planeGeometry args={[1.6, 1.6]} />
        <meshStandardMaterial color="#ebe7dc" />
      </mesh>
      <Grid
        args={[1.6, 1.6]}
        rotation={[Math.PI / 2, 0, 0]}
        cellSize={0.05}
        cellThickness={0.6}
        cellColor="#c9c3b3"
        sectionSize={0.25}
        sectionThickness={1}
        sectionColor="#9c9483"
        fadeDistance={6}
      />
    </group>
  );
}

/** The surface grid as line segments in the z = 0 plane: 5 cm cells, 25 cm sections, 1.6 m square. */
function surfaceGridLines(): THREE.LineSegments[] {
  const half = 0.8;
  const cells: number[] = [];
  const sections: number[] = [];
  for (let k = -16; k <= 16; k++) {
    const v = k * 0.05;
    const into = k % 5 === 0 ? sections : cells;
    into.push(-half, v, 0, half, v, 0, v, -half, 0, v, half, 0);
  }
  const segments = (points: number[], color: string) => {
    const geometry = new THREE.BufferGeometry();
    geometry.setAttribute("position", new THREE.Float32BufferAttribute(points, 3));
    return new THREE.LineSegments(geometry, new THREE.LineBasicMaterial({ color }));
  };
  return [segments(cells, "#c9c3b3"), segments(sections, "#9c9483")];
}

/** How far the arm can reach from its base (m): the chain's link offsets and the tool point, added up. */
function reachOf(chain: ArmChain): number {
  const len = (v: readonly number[]) => Math.hypot(v[0], v[1], v[2]);
  return Math.max(0.3, chain.joints.reduce((s, j) => s + len(j.origin.xyz), 0) + len(chain.tool.xyz));
}

/**
 * The 3D view: arm, ghosts, tool path, work surface and keep-out zones, with orbit controls. Memoised:
 * a page that re-renders with the same props does not draw a new frame.
 */
export default memo(function Stage({
  chain,
  joints,
  timeline,
  ghosts,
  linkSeverity,
  keepOut,
  findings,
  hold = false,
}: StageProps) {
  const playhead = usePlayheadStore();
  const compiled = useCompiled(chain, joints);
  // without a GPU every frame is drawn in software: fewer pixels, no multisampling
  const software = useMemo(() => webglInSoftware(), []);
  const touched = useMemo(() => touchedKeepOut(keepOut ?? [], findings ?? []), [keepOut, findings]);
  const view = useMemo(() => {
    const reach = reachOf(chain);
    const target: [number, number, number] = [0, 0, reach * 0.42];
    const dir = [1, -0.95, 0.42];
    const k = (reach * 2.5) / Math.hypot(dir[0], dir[1], dir[2]);
    return {
      target,
      position: [target[0] + dir[0] * k, target[1] + dir[1] * k, target[2] + dir[2] * k] as [number, number, number],
    };
  }, [chain]);
  return (
    <Canvas
      frameloop="demand"
      dpr={software ? 1 : [1, 1.5]}
      camera={{ position: view.position, up: [0, 0, 1], fov: 36, near: 0.01, far: 30 }}
      gl={{ antialias: !software, preserveDrawingBuffer: true }}
      aria-label="3D view: the arm at the playhead"
      role="img"
    >
      <color attach="background" args={["#f3f1ea"]} />
      <ambientLight intensity={0.75} />
      <directionalLight position={[1.2, -1.5, 2.2]} intensity={1.6} />
      <directionalLight position={[-1.5, 1, 1]} intensity={0.5} />
      <Invalidator playhead={playhead} hold={hold} />
      <WorkSurface software={software} />
      {keepOut?.map((b, i) => (
        <KeepOut key={i} box={b} touched={touched[i] ?? false} />
      ))}
      {ghosts.map((g) => (
        <GhostArm key={g.label} chain={chain} compiled={compiled} pose={g.pose} color={ghostColors[g.label]} />
      ))}
      <ToolPath compiled={compiled} timeline={timeline} />
      <AnimatedArm
        chain={chain}
        compiled={compiled}
        timeline={timeline}
        linkSeverity={linkSeverity}
        playhead={playhead}
        software={software}
      />
      <OrbitControls makeDefault target={view.target} enableDamping={false} />
    </Canvas>
  );
});
