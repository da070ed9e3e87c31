import { describe, expect, it } from "vitest";
import { globalToLocal, rotateToLocal } from "../../../lib/radio/orientation";

const DEG = Math.PI / 180;

describe("globalToLocal / rotateToLocal", () => {
  it("rotateToLocal (vector form) gives the angles of globalToLocal (eq. 7.1-7/7.1-8) for γ = 0", () => {
    const out = new Float64Array(3);
    for (const [theta, phi, alpha, beta] of [[95, 10, 30, 6], [60, -140, -75, 12], [120, 170, 0, -3], [90, 45, 45, 0]]) {
      const gx = Math.sin(theta * DEG) * Math.cos(phi * DEG), gy = Math.sin(theta * DEG) * Math.sin(phi * DEG), gz = Math.cos(theta * DEG);
      rotateToLocal(gx, gy, gz, Math.cos(alpha * DEG), Math.sin(alpha * DEG), Math.cos(beta * DEG), Math.sin(beta * DEG), out);
      const local = globalToLocal(theta, phi, alpha, beta);
      expect(Math.acos(out[2]) / DEG).toBeCloseTo(local.thetaDeg, 9);
      expect(Math.atan2(out[1], out[0]) / DEG).toBeCloseTo(local.phiDeg, 9);
    }
  });
  it("globalToLocal: a positive downtilt β makes a direction below the horizon look closer to boresight", () => {
    expect(globalToLocal(96, 0, 0, 6).thetaDeg).toBeCloseTo(90, 9);
    expect(globalToLocal(90, 0, 0, 6).thetaDeg).toBeCloseTo(84, 9);
  });
});
