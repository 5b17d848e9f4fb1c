/**
 * Kipping (2013, MNRAS 435, 2152) reparametrisation of quadratic limb
 * darkening: q1 = (u1 + u2)², q2 = u1 / (2(u1 + u2)) (eqs. 15–16), with the
 * inverse u1 = 2√q1·q2, u2 = √q1·(1 − 2q2) (eqs. 17–18). Uniform q1, q2 in
 * [0, 1] cover exactly the physical triangle u1 + u2 < 1, u1 > 0, u1 + 2u2 > 0.
 */

export function uFromQ(q1: number, q2: number): { u1: number; u2: number } {
  const s = Math.sqrt(q1);
  return { u1: 2 * s * q2, u2: s * (1 - 2 * q2) };
}

export function qFromU(u1: number, u2: number): { q1: number; q2: number } {
  const sum = u1 + u2;
  return { q1: sum * sum, q2: sum === 0 ? 0 : u1 / (2 * sum) };
}

/**
 * Physical quadratic limb darkening: intensity positive everywhere and
 * decreasing towards the limb (Kipping 2013, §2: u1 + u2 < 1, u1 > 0,
 * u1 + 2u2 > 0; here the boundaries are included so a uniform disc, u = 0, is allowed).
 */
export function isPhysicalQuadratic(u1: number, u2: number): boolean {
  return u1 + u2 <= 1 && u1 >= 0 && u1 + 2 * u2 >= 0;
}
