import fc from 'fast-check';
import { centralAngle, distanceKm, distanceMeters, distanceMiles, MEAN_EARTH_RADIUS_M, METERS_PER_MILE } from '../../lib/geo';
import { GrazingInputError } from '../../lib/grazing/errors';

const dms = (deg: number, min: number) => deg + min / 60;

describe('great-circle distance (haversine on a sphere of radius 6 371 008.8 m)', () => {
  it('LAX to JFK is 0.623585 rad, the worked example of the Aviation Formulary', () => {
    // Ed Williams, "Aviation Formulary" (v1.46), worked example: LAX (33°57'N 118°24'W) to JFK (40°38'N 73°47'W),
    // d = 0.623585 radians = 2144 nm on a sphere where 1 nm is one minute of arc. Published to 6 digits.
    const lax = { latitude: dms(33, 57), longitude: -dms(118, 24) };
    const jfk = { latitude: dms(40, 38), longitude: -dms(73, 47) };
    expect(centralAngle(lax, jfk)).toBeCloseTo(0.623585, 6);
    expect((centralAngle(lax, jfk) * 180 * 60) / Math.PI).toBeCloseTo(2144, 0);
    // On our sphere: 0.623585 × 6 371.0088 km = 3 972.87 km (the angle's 6 digits bound the error to ±3 m).
    expect(distanceKm(lax, jfk)).toBeGreaterThan(3972.86);
    expect(distanceKm(lax, jfk)).toBeLessThan(3972.88);
    expect(distanceMiles(lax, jfk)).toBeCloseTo(distanceKm(lax, jfk) / 1.609344, 9);
  });

  it('one degree along a meridian is R·π/180 = 111.195 km; a quarter meridian is R·π/2', () => {
    expect(distanceKm({ latitude: 39, longitude: -122 }, { latitude: 40, longitude: -122 })).toBeCloseTo((6371.0088 * Math.PI) / 180, 9);
    expect(distanceMeters({ latitude: 0, longitude: 10 }, { latitude: 90, longitude: 10 })).toBeCloseTo((MEAN_EARTH_RADIUS_M * Math.PI) / 2, 6);
  });

  it('a mile is 5 280 international feet = 1 609.344 m', () => {
    expect(METERS_PER_MILE).toBe(1609.344);
  });

  it('agrees with an independent computation: the chord between the points as unit vectors in 3-D', () => {
    const point = fc.record({ latitude: fc.double({ min: -89.9, max: 89.9, noNaN: true }), longitude: fc.double({ min: -180, max: 180, noNaN: true }) });
    const vec = (p: { latitude: number; longitude: number }) => {
      const φ = (p.latitude * Math.PI) / 180;
      const λ = (p.longitude * Math.PI) / 180;
      return [Math.cos(φ) * Math.cos(λ), Math.cos(φ) * Math.sin(λ), Math.sin(φ)];
    };
    fc.assert(
      fc.property(point, point, (a, b) => {
        const [x1, y1, z1] = vec(a);
        const [x2, y2, z2] = vec(b);
        const chord = Math.hypot(x1 - x2, y1 - y2, z1 - z2);
        const angle = 2 * Math.asin(Math.min(1, chord / 2));
        // Near antipodal points both forms take asin of a value near 1 and lose half their digits, so the
        // bound is 1e-7 rad (64 cm on the ground), far below what trucking distance needs.
        expect(Math.abs(centralAngle(a, b) - angle)).toBeLessThan(1e-7);
        expect(distanceMiles(a, b)).toBeCloseTo(distanceMiles(b, a), 9);
      }),
      { numRuns: 2000 },
    );
  });

  it('is 0 from a point to itself and refuses coordinates off the globe', () => {
    expect(distanceKm({ latitude: 39.7, longitude: -121.9 }, { latitude: 39.7, longitude: -121.9 })).toBe(0);
    expect(() => distanceKm({ latitude: 91, longitude: 0 }, { latitude: 0, longitude: 0 })).toThrow(GrazingInputError);
    expect(() => distanceKm({ latitude: 0, longitude: 0 }, { latitude: 0, longitude: 181 })).toThrow(/Longitude/);
  });
});
