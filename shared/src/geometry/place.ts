/**
 * Building atoms from internal coordinates (bond length, bond angle, torsion): the "natural
 * extension reference frame" placement used by every chain builder (Parsons et al. 2005,
 * J Comput Chem 26:1063).
 */
export type Vec3 = [number, number, number];

const sub = (p: Vec3, q: Vec3): Vec3 => [p[0] - q[0], p[1] - q[1], p[2] - q[2]];
const cross = (p: Vec3, q: Vec3): Vec3 => [
  p[1] * q[2] - p[2] * q[1],
  p[2] * q[0] - p[0] * q[2],
  p[0] * q[1] - p[1] * q[0],
];
const unit = (p: Vec3): Vec3 => {
  const l = Math.hypot(p[0], p[1], p[2]);
  return [p[0] / l, p[1] / l, p[2] / l];
};

/**
 * The point d with |c−d| = bondA, angle b–c–d = angleDeg and torsion a–b–c–d = torsionDeg
 * (IUPAC-IUB 1970 sign convention).
 */
export function placeAtom(
  a: Vec3,
  b: Vec3,
  c: Vec3,
  bondA: number,
  angleDeg: number,
  torsionDeg: number,
): Vec3 {
  const th = (angleDeg * Math.PI) / 180;
  const ph = (torsionDeg * Math.PI) / 180;
  const bc = unit(sub(c, b));
  const n = unit(cross(sub(b, a), bc));
  const m = cross(n, bc);
  const dx = -bondA * Math.cos(th);
  const dy = bondA * Math.sin(th) * Math.cos(ph);
  const dz = bondA * Math.sin(th) * Math.sin(ph);
  return [
    c[0] + dx * bc[0] + dy * m[0] + dz * n[0],
    c[1] + dx * bc[1] + dy * m[1] + dz * n[1],
    c[2] + dx * bc[2] + dy * m[2] + dz * n[2],
  ];
}
