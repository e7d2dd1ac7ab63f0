"use client";
import { useMemo } from "react";
import * as THREE from "three";
import type { ArmChain, CollisionShape } from "@/kinematics";

const Y = new THREE.Vector3(0, 1, 0);

/** One collision shape drawn in its link's frame (metres). */
export function ShapeMesh({ shape, material }: { shape: CollisionShape; material: THREE.Material }) {
  const placement = useMemo(() => {
    if (shape.kind === "capsule") {
      const a = new THREE.Vector3(...shape.from);
      const b = new THREE.Vector3(...shape.to);
      const dir = b.clone().sub(a);
      const length = dir.length();
      const q = new THREE.Quaternion();
      if (length > 1e-9) q.setFromUnitVectors(Y, dir.clone().normalize());
      return { position: a.add(b).multiplyScalar(0.5), quaternion: q, length };
    }
    return null;
  }, [shape]);
  if (shape.kind === "sphere") {
    return (
      <mesh position={shape.center} material={material} castShadow>
        <sphereGeometry args={[shape.radius, 24, 16]} />
      </mesh>
    );
  }
  if (shape.kind === "box") {
    // URDF rpy is R = Rz(yaw)·Ry(pitch)·Rx(roll): three's Euler order "ZYX" composes the same matrix.
    return (
      <mesh
        position={shape.center}
        rotation={new THREE.Euler(shape.rpy[0], shape.rpy[1], shape.rpy[2], "ZYX")}
        material={material}
        castShadow
      >
        <boxGeometry args={shape.size} />
      </mesh>
    );
  }
  return (
    <mesh position={placement!.position} quaternion={placement!.quaternion} material={material} castShadow>
      <capsuleGeometry args={[shape.radius, placement!.length, 6, 16]} />
    </mesh>
  );
}

/** The shapes of link `i` (0 = base) of a chain. */
export function linkShapes(chain: ArmChain, i: number): CollisionShape[] {
  return i === 0 ? chain.base.collision : (chain.joints[i - 1]?.link.collision ?? []);
}
