/**
 * URDF import: parses a URDF file (XML) into an arm description — moving joints in chain
 * order with limits, origins and axes, the links' inertial data and primitive collision
 * shapes, and the tool point. Fixed joints are folded into the next moving joint's origin
 * (their links' masses and shapes into the moving link before them) or, after the last
 * moving joint, into the tool point. Bad files give problems that name the element.
 *
 * Follows the URDF XML specification: `origin` xyz/rpy (identity if absent, R = Rz·Ry·Rx),
 * `axis` default (1, 0, 0), `limit` required on revolute and prismatic joints with `effort`
 * and `velocity` required and `lower`/`upper` defaulting to 0, `dynamics` damping/friction
 * default 0. Cylinders become capsules of the same axis segment and radius (a conservative
 * cover for clearance); meshes are skipped.
 *
 * @module
 */
import { XMLParser, XMLValidator } from "fast-xml-parser";
import type { ArmDescription, ArmDescriptionJoint, CollisionShape, Link } from "../plan/arm-model";
import { combineInertial, inertiaToMatrix, transformInertial, type FlatInertial } from "./chain";
import * as mat4 from "./mat4";

/** One problem with a URDF file, naming the element (`joint "elbow" <limit>`). */
export interface UrdfProblem {
  /** The element, e.g. `joint "elbow" <origin xyz>`. */
  element: string;
  /** What is wrong. */
  message: string;
}

/** Result of {@link parseUrdf}. */
export type UrdfResult = { ok: true; value: ArmDescription } | { ok: false; problems: UrdfProblem[] };

type XmlNode = Record<string, unknown>;

/** An attribute's text, or undefined when absent (or not text). */
function attr(node: XmlNode | undefined, key: string): string | undefined {
  const v = node?.[key];
  return typeof v === "string" ? v : undefined;
}

const MOVING = new Set(["revolute", "continuous", "prismatic"]);

class UrdfError extends Error {
  constructor(readonly problems: UrdfProblem[]) {
    super(problems.map((p) => `${p.element}: ${p.message}`).join("\n"));
  }
}

interface RawJoint {
  name: string;
  type: string;
  parent: string;
  child: string;
  origin: Float64Array;
  axis: [number, number, number];
  min: number | null;
  max: number | null;
  maxVelocity: number | null;
  maxEffort: number | null;
  damping: number;
  friction: number;
}

interface RawLink {
  name: string;
  inertial: FlatInertial | null;
  collision: { origin: Float64Array; shape: CollisionShape }[];
}

/** Parses URDF text into an arm description, or lists every problem found. */
export function parseUrdf(xml: string): UrdfResult {
  try {
    return { ok: true, value: importUrdf(xml) };
  } catch (e) {
    if (e instanceof UrdfError) return { ok: false, problems: e.problems };
    return { ok: false, problems: [{ element: "(file)", message: e instanceof Error ? e.message : String(e) }] };
  }
}

function importUrdf(xml: string): ArmDescription {
  const valid = XMLValidator.validate(xml);
  if (valid !== true) {
    throw new UrdfError([{ element: `(XML line ${valid.err.line})`, message: valid.err.msg }]);
  }
  const parser = new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: "",
    parseAttributeValue: false,
    isArray: (name, _jpath, _leaf, isAttribute) =>
      !isAttribute && ["link", "joint", "collision", "robot"].includes(name),
  });
  const doc = parser.parse(xml) as { robot?: XmlNode[] };
  const robot = doc.robot?.[0];
  if (!robot) throw new UrdfError([{ element: "<robot>", message: "missing: a URDF file has one <robot> element" }]);
  const problems: UrdfProblem[] = [];
  const links = new Map<string, RawLink>();
  for (const l of asList(robot.link)) {
    const name = attr(l, "name");
    if (!name) {
      problems.push({ element: "<link>", message: "has no name attribute" });
      continue;
    }
    if (links.has(name)) problems.push({ element: `link "${name}"`, message: "is defined twice" });
    links.set(name, readLink(l, name, problems));
  }
  const joints: RawJoint[] = [];
  const jointNames = new Set<string>();
  for (const j of asList(robot.joint)) {
    const raw = readJoint(j, problems);
    if (!raw) continue;
    if (jointNames.has(raw.name)) problems.push({ element: `joint "${raw.name}"`, message: "is defined twice" });
    jointNames.add(raw.name);
    for (const side of ["parent", "child"] as const) {
      if (!links.has(raw[side]))
        problems.push({
          element: `joint "${raw.name}" <${side}>`,
          message: `names link "${raw[side]}", which is not defined`,
        });
    }
    joints.push(raw);
  }
  if (links.size === 0) problems.push({ element: "<robot>", message: "has no <link> elements" });
  if (problems.length) throw new UrdfError(problems);

  // Tree structure: each link has at most one parent joint; exactly one root; no cycles.
  const parentOf = new Map<string, RawJoint>();
  const children = new Map<string, RawJoint[]>();
  for (const j of joints) {
    const earlier = parentOf.get(j.child);
    if (earlier)
      problems.push({
        element: `joint "${j.name}"`,
        message: `link "${j.child}" already has parent joint "${earlier.name}"`,
      });
    parentOf.set(j.child, j);
    children.set(j.parent, [...(children.get(j.parent) ?? []), j]);
  }
  if (problems.length) throw new UrdfError(problems);
  const roots = [...links.keys()].filter((n) => !parentOf.has(n));
  const reached = new Set<string>();
  const walk = (n: string) => {
    reached.add(n);
    for (const j of children.get(n) ?? []) if (!reached.has(j.child)) walk(j.child);
  };
  roots.forEach(walk);
  const inCycle = joints.filter((j) => !reached.has(j.child)).map((j) => `"${j.name}"`);
  if (inCycle.length)
    throw new UrdfError([{ element: `joints ${inCycle.join(", ")}`, message: "form a cycle; a URDF must be a tree" }]);
  if (roots.length !== 1) {
    throw new UrdfError([
      {
        element: "<robot>",
        message: `must have one root link, has ${roots.length} (${roots.map((r) => `"${r}"`).join(", ")})`,
      },
    ]);
  }

  // Main path: the branch with the most moving joints (then the deepest); other branches must be fixed.
  const score = (n: string): [number, number] => {
    let best: [number, number] = [0, 0];
    for (const j of children.get(n) ?? []) {
      const s = score(j.child);
      const t: [number, number] = [s[0] + (MOVING.has(j.type) ? 1 : 0), s[1] + 1];
      if (t[0] > best[0] || (t[0] === best[0] && t[1] > best[1])) best = t;
    }
    return best;
  };
  const movingBelow = (n: string): boolean =>
    (children.get(n) ?? []).some((j) => MOVING.has(j.type) || movingBelow(j.child));

  const outJoints: ArmDescriptionJoint[] = [];
  const outLinks: Link[] = [];
  let body: Body = newBody(roots[0]);
  let acc = mat4.create(); // transform from the current moving link's frame to the walk position
  let link = roots[0];
  foldLink(body, links.get(link)!, acc);
  for (;;) {
    const kids = children.get(link) ?? [];
    if (kids.length === 0) break;
    let next = kids[0];
    let nextScore = [-1, -1];
    for (const j of kids) {
      const s = score(j.child);
      const t = [s[0] + (MOVING.has(j.type) ? 1 : 0), s[1] + 1];
      if (t[0] > nextScore[0] || (t[0] === nextScore[0] && t[1] > nextScore[1])) {
        next = j;
        nextScore = t;
      }
    }
    for (const side of kids) {
      if (side === next) continue;
      if (MOVING.has(side.type) || movingBelow(side.child)) {
        problems.push({
          element: `joint "${side.name}"`,
          message: `starts a second moving branch at link "${link}"; only serial chains are supported`,
        });
      } else {
        foldSubtree(body, side, acc, links, children);
      }
    }
    if (problems.length) throw new UrdfError(problems);
    const at = mat4.multiply(mat4.create(), acc, next.origin);
    if (MOVING.has(next.type)) {
      outLinks.push(finishBody(body));
      outJoints.push({
        name: next.name,
        type: next.type as ArmDescriptionJoint["type"],
        min: next.min,
        max: next.max,
        maxVelocity: next.maxVelocity ?? 1e6,
        ...(next.maxEffort !== null ? { maxEffort: next.maxEffort } : {}),
        friction: { coulomb: next.friction, viscous: next.damping },
        origin: originOf(at),
        axis: next.axis,
      });
      body = newBody(next.child);
      acc = mat4.create();
    } else {
      acc = at;
    }
    link = next.child;
    foldLink(body, links.get(link)!, acc);
  }
  outLinks.push(finishBody(body));
  if (outJoints.length === 0)
    throw new UrdfError([{ element: "<robot>", message: "has no revolute, continuous or prismatic joint" }]);
  return {
    name: attr(robot, "name") ?? "imported arm",
    joints: outJoints,
    links: outLinks,
    tool: originOf(acc),
    gravity: [0, 0, -9.81],
  };
}

interface Body {
  name: string;
  inertial: FlatInertial | null;
  collision: CollisionShape[];
}

function newBody(name: string): Body {
  return { name, inertial: null, collision: [] };
}

function finishBody(b: Body): Link {
  const out: Link = { name: b.name, collision: b.collision };
  if (b.inertial) {
    const i = b.inertial.inertia;
    out.inertial = {
      mass: b.inertial.mass,
      com: b.inertial.com,
      inertia: { ixx: i[0], ixy: i[3], ixz: i[6], iyy: i[4], iyz: i[7], izz: i[8] },
    };
  }
  return out;
}

/** Adds a link's mass and shapes, placed by `t` (link frame → body frame), to the body. */
function foldLink(body: Body, link: RawLink, t: Float64Array) {
  if (link.inertial) {
    const moved = transformInertial(t, link.inertial);
    body.inertial = body.inertial ? combineInertial(body.inertial, moved) : moved;
  }
  for (const c of link.collision) body.collision.push(placeShape(mat4.multiply(mat4.create(), t, c.origin), c.shape));
}

function foldSubtree(
  body: Body,
  j: RawJoint,
  t: Float64Array,
  links: Map<string, RawLink>,
  children: Map<string, RawJoint[]>,
) {
  const at = mat4.multiply(mat4.create(), t, j.origin);
  foldLink(body, links.get(j.child)!, at);
  for (const k of children.get(j.child) ?? []) foldSubtree(body, k, at, links, children);
}

/** A shape given in a local frame `t` (collision origin, possibly after folded fixed joints), moved into the body frame. */
function placeShape(t: Float64Array, s: CollisionShape): CollisionShape {
  const p = (v: readonly number[]): [number, number, number] => {
    const o = [0, 0, 0];
    mat4.transformPoint(o, t, v);
    return [o[0], o[1], o[2]];
  };
  if (s.kind === "sphere") return { kind: "sphere", center: p(s.center), radius: s.radius };
  if (s.kind === "capsule") return { kind: "capsule", from: p(s.from), to: p(s.to), radius: s.radius };
  const local = mat4.fromXyzRpy(mat4.create(), s.center, s.rpy);
  const m = mat4.multiply(mat4.create(), t, local);
  const o = originOf(m);
  return { kind: "box", center: o.xyz, size: s.size, rpy: o.rpy };
}

function originOf(m: Float64Array) {
  const rpy = mat4.toRpy([0, 0, 0], m);
  const clean = (v: number) => (Math.abs(v) < 1e-12 ? 0 : v);
  return {
    xyz: [clean(m[12]), clean(m[13]), clean(m[14])] as [number, number, number],
    rpy: [clean(rpy[0]), clean(rpy[1]), clean(rpy[2])] as [number, number, number],
  };
}

function asList(v: unknown): XmlNode[] {
  if (v === undefined || v === null || v === "") return [];
  return (Array.isArray(v) ? v : [v]).map((x) =>
    typeof x === "object" && x !== null ? (x as XmlNode) : ({} as XmlNode),
  );
}

function first(v: unknown): XmlNode | undefined {
  const l = asList(v);
  return l[0];
}

function numbers(
  text: string | undefined,
  count: number,
  element: string,
  problems: UrdfProblem[],
  fallback: number[],
): number[] {
  if (text === undefined) return fallback;
  const parts = text.trim().split(/\s+/);
  const vals = parts.map(Number);
  if (parts.length !== count || vals.some((v) => !Number.isFinite(v))) {
    problems.push({ element, message: `"${text}" is not ${count === 1 ? "a number" : `${count} numbers`}` });
    return fallback;
  }
  return vals;
}

function readOrigin(node: XmlNode | undefined, element: string, problems: UrdfProblem[]): Float64Array {
  const xyz = numbers(node?.xyz as string | undefined, 3, `${element} <origin xyz>`, problems, [0, 0, 0]);
  const rpy = numbers(node?.rpy as string | undefined, 3, `${element} <origin rpy>`, problems, [0, 0, 0]);
  return mat4.fromXyzRpy(mat4.create(), xyz, rpy);
}

function readLink(l: XmlNode, name: string, problems: UrdfProblem[]): RawLink {
  const el = `link "${name}"`;
  let inertial: FlatInertial | null = null;
  const inr = first(l.inertial);
  if (inr) {
    const origin = readOrigin(first(inr.origin), `${el} <inertial>`, problems);
    const massNode = first(inr.mass);
    const mass = numbers(massNode?.value as string | undefined, 1, `${el} <inertial><mass value>`, problems, [NaN])[0];
    if (massNode === undefined || massNode.value === undefined)
      problems.push({ element: `${el} <inertial><mass>`, message: "is required" });
    else if (mass < 0) problems.push({ element: `${el} <inertial><mass value>`, message: "must be 0 or greater" });
    const it = first(inr.inertia);
    const keys = ["ixx", "ixy", "ixz", "iyy", "iyz", "izz"] as const;
    const vals: Record<string, number> = {};
    for (const k of keys) {
      const v = it?.[k] as string | undefined;
      if (v === undefined) {
        problems.push({ element: `${el} <inertial><inertia ${k}>`, message: "is required" });
        vals[k] = 0;
      } else vals[k] = numbers(v, 1, `${el} <inertial><inertia ${k}>`, problems, [0])[0];
    }
    if (Number.isFinite(mass)) {
      inertial = transformInertial(origin, {
        mass,
        com: [0, 0, 0],
        inertia: inertiaToMatrix({
          ixx: vals.ixx,
          ixy: vals.ixy,
          ixz: vals.ixz,
          iyy: vals.iyy,
          iyz: vals.iyz,
          izz: vals.izz,
        }),
      });
    }
  }
  const collision: RawLink["collision"] = [];
  asList(l.collision).forEach((c, i) => {
    const cel = `${el} <collision> ${i + 1}`;
    const origin = readOrigin(first(c.origin), cel, problems);
    const g = first(c.geometry);
    if (!g) {
      problems.push({ element: cel, message: "has no <geometry>" });
      return;
    }
    const positive = (v: number, what: string) => {
      if (!(v > 0)) problems.push({ element: `${cel} ${what}`, message: "must be greater than 0" });
      return v;
    };
    if (g.box !== undefined) {
      const size = numbers(first(g.box)?.size as string | undefined, 3, `${cel} <box size>`, problems, [NaN, NaN, NaN]);
      if (first(g.box)?.size === undefined) problems.push({ element: `${cel} <box size>`, message: "is required" });
      else if (size.every((v) => positive(v, "<box size>") > 0))
        collision.push({
          origin,
          shape: { kind: "box", center: [0, 0, 0], size: [size[0], size[1], size[2]], rpy: [0, 0, 0] },
        });
    } else if (g.sphere !== undefined) {
      const r = numbers(first(g.sphere)?.radius as string | undefined, 1, `${cel} <sphere radius>`, problems, [NaN])[0];
      if (positive(r, "<sphere radius>") > 0)
        collision.push({ origin, shape: { kind: "sphere", center: [0, 0, 0], radius: r } });
    } else if (g.cylinder !== undefined) {
      const cyl = first(g.cylinder);
      const r = numbers(cyl?.radius as string | undefined, 1, `${cel} <cylinder radius>`, problems, [NaN])[0];
      const len = numbers(cyl?.length as string | undefined, 1, `${cel} <cylinder length>`, problems, [NaN])[0];
      if (positive(r, "<cylinder radius>") > 0 && positive(len, "<cylinder length>") > 0)
        collision.push({ origin, shape: { kind: "capsule", from: [0, 0, -len / 2], to: [0, 0, len / 2], radius: r } });
    } else if (g.mesh === undefined) {
      problems.push({ element: `${cel} <geometry>`, message: "needs a <box>, <cylinder>, <sphere> or <mesh>" });
    }
  });
  return { name, inertial, collision };
}

function readJoint(j: XmlNode, problems: UrdfProblem[]): RawJoint | null {
  const name = attr(j, "name");
  if (!name) {
    problems.push({ element: "<joint>", message: "has no name attribute" });
    return null;
  }
  const el = `joint "${name}"`;
  const type = attr(j, "type");
  if (type === undefined) {
    problems.push({ element: el, message: "has no type attribute" });
    return null;
  }
  if (!MOVING.has(type) && type !== "fixed") {
    const known = type === "floating" || type === "planar";
    problems.push({
      element: `${el} type`,
      message: known
        ? `"${type}" joints are not supported (use revolute, continuous, prismatic or fixed)`
        : `"${type}" is not a URDF joint type (revolute, continuous, prismatic, fixed, floating, planar)`,
    });
    return null;
  }
  const parent = first(j.parent)?.link as string | undefined;
  const child = first(j.child)?.link as string | undefined;
  if (!parent) problems.push({ element: `${el} <parent>`, message: 'is missing (needs link="…")' });
  if (!child) problems.push({ element: `${el} <child>`, message: 'is missing (needs link="…")' });
  const origin = readOrigin(first(j.origin), el, problems);
  const a = numbers(first(j.axis)?.xyz as string | undefined, 3, `${el} <axis xyz>`, problems, [1, 0, 0]);
  const len = Math.hypot(a[0], a[1], a[2]);
  if (len < 1e-12) problems.push({ element: `${el} <axis xyz>`, message: "must not be the zero vector" });
  const axis: [number, number, number] = len > 0 ? [a[0] / len, a[1] / len, a[2] / len] : [1, 0, 0];
  const lim = first(j.limit);
  let min: number | null = null,
    max: number | null = null,
    maxVelocity: number | null = null,
    maxEffort: number | null = null;
  if (type === "revolute" || type === "prismatic") {
    if (!lim) problems.push({ element: `${el} <limit>`, message: `is required on a ${type} joint` });
    else {
      min = numbers(lim.lower as string | undefined, 1, `${el} <limit lower>`, problems, [0])[0];
      max = numbers(lim.upper as string | undefined, 1, `${el} <limit upper>`, problems, [0])[0];
      if (min > max) problems.push({ element: `${el} <limit upper>`, message: `must not be below lower (${min})` });
    }
  }
  if (lim && MOVING.has(type)) {
    for (const k of ["velocity", "effort"] as const) {
      if (lim[k] === undefined) problems.push({ element: `${el} <limit ${k}>`, message: "is required" });
    }
    maxVelocity = numbers(lim.velocity as string | undefined, 1, `${el} <limit velocity>`, problems, [NaN])[0];
    maxEffort = numbers(lim.effort as string | undefined, 1, `${el} <limit effort>`, problems, [NaN])[0];
    if (lim.velocity !== undefined && Number.isFinite(maxVelocity) && !(maxVelocity > 0))
      problems.push({ element: `${el} <limit velocity>`, message: "must be greater than 0" });
    if (lim.effort !== undefined && Number.isFinite(maxEffort) && !(maxEffort >= 0))
      problems.push({ element: `${el} <limit effort>`, message: "must be 0 or greater" });
    if (!Number.isFinite(maxVelocity)) maxVelocity = null;
    if (!Number.isFinite(maxEffort)) maxEffort = null;
  }
  const dyn = first(j.dynamics);
  const damping = numbers(dyn?.damping as string | undefined, 1, `${el} <dynamics damping>`, problems, [0])[0];
  const friction = numbers(dyn?.friction as string | undefined, 1, `${el} <dynamics friction>`, problems, [0])[0];
  if (!parent || !child) return null;
  return { name, type, parent, child, origin, axis, min, max, maxVelocity, maxEffort, damping, friction };
}
