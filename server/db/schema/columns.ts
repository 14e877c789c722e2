import { customType } from 'drizzle-orm/pg-core';

/**
 * PostGIS geometry columns. Drizzle's built-in geometry type only covers points and drops the SRID,
 * so both are declared here with their full type; repositories read them with ST_X/ST_Y or ST_AsGeoJSON.
 */
export const pointGeometry = customType<{ data: string; driverData: string }>({
  dataType: () => 'geometry(Point,4326)',
});
export const multiPolygonGeometry = customType<{ data: string; driverData: string }>({
  dataType: () => 'geometry(MultiPolygon,4326)',
});

/** Raw bytes (PostgreSQL bytea), as a Buffer. */
export const bytes = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => 'bytea',
});
