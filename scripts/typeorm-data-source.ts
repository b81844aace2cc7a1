// The DataSource instance TypeORM's CLI needs as a file's default export (scripts/typeorm.sh), built
// by the server's own factory from the same configuration the server reads.
import { loadConfig } from '../backend/src/config';
import { createDataSource } from '../backend/src/db/data-source';

export default createDataSource({ databaseUrl: loadConfig().databaseUrl, poolSize: 2 });
