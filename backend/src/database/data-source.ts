import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { validateEnv } from '../config/env';
import { buildDataSourceOptions } from './data-source-options';

/** For the TypeORM CLI (`typeorm migration:run -d dist/database/data-source.js`). */
export default new DataSource(buildDataSourceOptions(validateEnv().databaseUrl));
