// Limits of a tube table's measured-wall rule shared by the compiler, the editor and the docs.

/** A percent tolerance must stay under this: 50 % would accept a wall half as thick as the table's. */
export const MEASURED_WALL_MAX_PERCENT = 50;
