import { customType } from 'drizzle-orm/pg-core';

/**
 * PostgreSQL `real` (float4) for numbers derived from a definition (sizes, volumes, tolerance) that
 * are kept as columns for listing and sorting. float4 holds magnitudes from about 1.2e-38 up; a
 * smaller one (a fuzzed tolerance of 1e-300 mm) made PostgreSQL refuse the insert ("value out of
 * range: underflow"), a 500. Anything below 1e-30 is stored as 0; the definition keeps the value.
 */
export const float4 = customType<{ data: number; driverData: number | string }>({
	dataType: () => 'real',
	toDriver: (value) => (Math.abs(value) < 1e-30 ? 0 : value),
	fromDriver: (value) => Number(value)
});
