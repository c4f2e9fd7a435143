import { describe, it, expect, beforeAll } from "vitest";
import { analyzeFrame, type Connectivity } from "../src/index";
import { gaussianRandomField, type RandomField } from "../src/demo/grf";

// Excursion sets {X >= u} of a zero-mean isotropic Gaussian field of variance s^2 with
// lambda2 = Var(dX/dx), nu = u/s (Adler 1981, The Geometry of Random Fields; Worsley et al.
// 1996, Hum. Brain Mapp. 4:58; values as listed in CHECKS.md):
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

// 48 x 512^2 = 1.26e7 px with correlation length 8 px: at 4e6 px the sampling noise of the
// Euler count at nu = 1.5 is itself about 2%, so use three times that.
const FIELDS = 48, SIZE = 512;
let fields: RandomField[] = [];

beforeAll(() => {
  fields = Array.from({ length: FIELDS }, (_, k) =>
    gaussianRandomField({ width: SIZE, height: SIZE, spectrum: "gaussian", smoothing: 4, seed: 1000 + k }));
});

function measure(nu: number, connectivity: Connectivity) {
  let area = 0, wall = 0, euler = 0, lambda = 0, pixels = 0;
  for (const f of fields) {
    const r = analyzeFrame(f, { threshold: nu, connectivity, boundary: "periodic", skeleton: "off", spectrum: "off" });
    pixels += SIZE * SIZE;
    area += r.up.area;
    wall += r.wallLength;
    euler += r.up.euler;
    lambda += ((f.lambda2x + f.lambda2y) / 2) * SIZE * SIZE;
  }
  const lambda2 = lambda / pixels; // the fields have unit variance exactly
  return {
    areaFraction: area / pixels,
    wallDensity: wall / pixels,
    eulerDensity: euler / pixels,
    expected: {
      areaFraction: erfc(nu / Math.SQRT2) / 2,
      wallDensity: 0.5 * Math.sqrt(lambda2) * Math.exp(-nu * nu / 2),
      eulerDensity: (lambda2 / (2 * Math.PI) ** 1.5) * nu * Math.exp(-nu * nu / 2),
    },
  };
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("excursion sets of Gaussian random fields against Adler's formulas", () => {
  for (const nu of [-1, 1, 1.5]) {
    it(`matches area fraction, Crofton wall length and Euler density within 3% at nu = ${nu} (saddle rule)`, () => {
      const m = measure(nu, "saddle");
      expect(rel(m.areaFraction, m.expected.areaFraction)).toBeLessThan(0.03);
      expect(rel(m.wallDensity, m.expected.wallDensity)).toBeLessThan(0.03);
      expect(rel(m.eulerDensity, m.expected.eulerDensity)).toBeLessThan(0.03);
    });
  }

  it("matches them within 3% with the minority phase 8-connected (fixed rule)", () => {
    for (const nu of [-1.5, 1.5]) {
      const m = measure(nu, nu > 0 ? 8 : 4);
      expect(rel(m.areaFraction, m.expected.areaFraction)).toBeLessThan(0.03);
      expect(rel(m.wallDensity, m.expected.wallDensity)).toBeLessThan(0.03);
      expect(rel(m.eulerDensity, m.expected.eulerDensity)).toBeLessThan(0.03);
    }
  });

  it("puts half the area above nu = 0 and an Euler density near zero there", () => {
    const m = measure(0, "saddle");
    expect(Math.abs(m.areaFraction - 0.5)).toBeLessThan(0.01);
    // chi_A(0) = 0; allow 3% of the peak density lambda2 / (2 pi)^(3/2) e^(-1/2) at nu = 1.
    const peak = Math.abs(measure(1, "saddle").expected.eulerDensity);
    expect(Math.abs(m.eulerDensity)).toBeLessThan(0.03 * peak);
  });
});
