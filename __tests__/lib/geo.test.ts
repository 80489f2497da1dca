import fc from 'fast-check';
import { boundingBox, centralAngle, distanceKm, distanceMeters, distanceMiles, MEAN_EARTH_RADIUS_M, METERS_PER_MILE, type LatLngBox } from '../../lib/geo';
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

describe('boundingBox (the market\'s prefilter before the exact distance)', () => {
  const inBox = (box: LatLngBox, p: { latitude: number; longitude: number }) =>
    p.latitude >= box.latMin && p.latitude <= box.latMax && (box.lngRanges.length === 0 || box.lngRanges.some(([w, e]) => p.longitude >= w && p.longitude <= e));
  const point = fc.record({ latitude: fc.double({ min: -90, max: 90, noNaN: true }), longitude: fc.double({ min: -180, max: 180, noNaN: true }) });

  it('When a point is within the distance, then it is inside the box — anywhere on the globe, across ±180° and round the poles', () => {
    fc.assert(
      fc.property(point, fc.double({ min: 0.001, max: 13_000, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }), (c, miles, f, bearing) => {
        // A point at distance f × miles along `bearing`, by the direct formula on the sphere.
        const δ = (f * miles) / (MEAN_EARTH_RADIUS_M / METERS_PER_MILE);
        const φ1 = (c.latitude * Math.PI) / 180;
        const λ1 = (c.longitude * Math.PI) / 180;
        const φ2 = Math.asin(Math.min(1, Math.max(-1, Math.sin(φ1) * Math.cos(δ) + Math.cos(φ1) * Math.sin(δ) * Math.cos(bearing))));
        const λ2 = λ1 + Math.atan2(Math.sin(bearing) * Math.sin(δ) * Math.cos(φ1), Math.cos(δ) - Math.sin(φ1) * Math.sin(φ2));
        const p = { latitude: (φ2 * 180) / Math.PI, longitude: ((((λ2 * 180) / Math.PI + 540) % 360) + 360) % 360 - 180 };
        if (!(distanceMiles(c, p) <= miles)) return; // rounding may put the generated point just outside: nothing to check
        const box = boundingBox(c, miles);
        if (box) expect(inBox(box, p)).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it('When the circle is small and away from the poles and ±180°, then the box is one tight range: 1° of latitude is 69.09 miles', () => {
    const box = boundingBox({ latitude: 38, longitude: -120 }, 69.09)!;
    expect(box.latMax - 38).toBeCloseTo(1, 3);
    expect(box.lngRanges).toHaveLength(1);
    // At 38° a degree of longitude is cos 38° as long: the half-width is about 1 / cos 38° = 1.269°.
    expect(box.lngRanges[0][1] + 120).toBeCloseTo(1 / Math.cos((38 * Math.PI) / 180), 2);
  });

  it('When the circle crosses the antimeridian, then two longitude ranges; when it holds a pole, then every longitude; when it covers the globe, then none', () => {
    expect(boundingBox({ latitude: -17.8, longitude: 179.95 }, 50)!.lngRanges).toHaveLength(2);
    expect(boundingBox({ latitude: 89.5, longitude: 10 }, 50)!.lngRanges).toEqual([]);
    expect(boundingBox({ latitude: 0, longitude: 0 }, 13_000)).toBeNull();
  });
});
