import { describe, it, expect, beforeAll } from "vitest";
import { analyzeFrame, hexGaussianRandomField, type HexRandomField } from "../../src/index";

// Excursion sets {X >= u} of a zero-mean isotropic Gaussian field of variance s^2 with
// lambda2 = Var(dX/dx), nu = u/s (Adler 1981, The Geometry of Random Fields; Worsley et al.
// 1996, Hum. Brain Mapp. 4:58; as listed in CHECKS.md), here sampled at the sites of a
// hexagonal lattice, each site covering sqrt(3)/2 lattice constants squared:
//   area fraction = erfc(nu / sqrt 2) / 2
//   wall length per area L_A = (1/2) (sqrt(lambda2) / s) exp(-nu^2 / 2)
//   Euler characteristic per area chi_A = lambda2 / ((2 pi)^(3/2) s^2) nu exp(-nu^2 / 2)

function erfc(x: number): number {
  // Numerical Recipes' erfcc (Chebyshev fit, fractional error < 1.2e-7), from memory.
  const z = Math.abs(x), t = 1 / (1 + 0.5 * z);
  const r = t * Math.exp(-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 +
    t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 +
    t * (-0.82215223 + t * 0.17087277)))))))));
  return x >= 0 ? r : 2 - r;
}

// 24 tori of 512 x 512 sites (6.3e6 sites) with smoothing length 4 lattice constants.
const FIELDS = 24, SIZE = 512, SITE = Math.sqrt(3) / 2;
let fields: HexRandomField[] = [];

beforeAll(() => {
  fields = Array.from({ length: FIELDS }, (_, k) =>
    hexGaussianRandomField({ width: SIZE, height: SIZE, spectrum: "gaussian", smoothing: 4, seed: 7000 + k }));
}, 120_000);

function measure(nu: number) {
  let area = 0, wall = 0, euler = 0, lambda = 0, total = 0, sites = 0, up = 0;
  for (const f of fields) {
    const r = analyzeFrame(f, { grid: "hex", threshold: nu, boundary: "periodic", skeleton: "off", spectrum: "off" });
    const frameArea = SIZE * SIZE * SITE;
    total += frameArea;
    area += r.up.area;
    wall += r.wallLength;
    euler += r.up.euler;
    lambda += ((f.lambda2x + f.lambda2y) / 2) * frameArea;
    sites += SIZE * SIZE;
    for (let i = 0; i < f.data.length; i++) if (f.data[i]! > nu) up++;
  }
  const lambda2 = lambda / total; // unit variance of the continuous field
  return {
    areaFraction: area / total, siteFraction: up / sites,
    wallDensity: wall / total, eulerDensity: euler / total,
    expected: {
      areaFraction: erfc(nu / Math.SQRT2) / 2,
      wallDensity: 0.5 * Math.sqrt(lambda2) * Math.exp(-nu * nu / 2),
      eulerDensity: (lambda2 / (2 * Math.PI) ** 1.5) * nu * Math.exp(-nu * nu / 2),
    },
  };
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("excursion sets of Gaussian random fields on a hexagonal lattice against Adler's formulas", () => {
  for (const nu of [-1.5, -1, 1, 1.5]) {
    it(`matches area fraction, Crofton wall length and Euler density within 3% at nu = ${nu}`, () => {
      const m = measure(nu);
      expect(m.areaFraction).toBeCloseTo(m.siteFraction, 12); // area = sites x sqrt(3)/2
      expect(rel(m.areaFraction, m.expected.areaFraction)).toBeLessThan(0.03);
      expect(rel(m.wallDensity, m.expected.wallDensity)).toBeLessThan(0.03);
      expect(rel(m.eulerDensity, m.expected.eulerDensity)).toBeLessThan(0.03);
    });
  }

  it("the field itself is isotropic: equal mean square derivatives along x and y within 3%", () => {
    let x = 0, y = 0;
    for (const f of fields) { x += f.lambda2x; y += f.lambda2y; }
    expect(rel(x, y)).toBeLessThan(0.03);
  });

  it("puts half the area above nu = 0 and an Euler density near zero there (same rule for both phases)", () => {
    const m = measure(0);
    expect(Math.abs(m.areaFraction - 0.5)).toBeLessThan(0.01);
    const peak = Math.abs(measure(1).expected.eulerDensity);
    expect(Math.abs(m.eulerDensity)).toBeLessThan(0.03 * peak);
  });
});
