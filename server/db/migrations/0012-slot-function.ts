import type { MigrationFn } from 'umzug';
import type { MigrationContext } from '../migrate.js';

/**
 * Taking an evaluation slot in one round trip. The five statements of the old transaction
 * (advisory lock, count, delete of expired rows, insert, commit) each cost a round trip
 * on the request's path; as a PL/pgSQL function they run in the server, and because each
 * statement inside a VOLATILE function takes a fresh snapshot under READ COMMITTED, the count after
 * the lock sees every slot committed before it, as the transaction did.
 * Returns (id, 0, null) when a slot was taken, or (null, count, age of the oldest in ms).
 */
export const up: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.query(`
    CREATE FUNCTION take_evaluation_slot(slot_owner text, cap integer, ttl_seconds integer)
      RETURNS TABLE (slot_id bigint, running integer, oldest_ms double precision)
      LANGUAGE plpgsql VOLATILE AS $$
    DECLARE
      n integer;
      oldest double precision;
    BEGIN
      PERFORM pg_advisory_xact_lock(hashtext('evaluation_slots:' || slot_owner));
      SELECT count(*)::int, (extract(epoch FROM now() - min(created_at)) * 1000)::float8
        INTO n, oldest
        FROM evaluation_slots WHERE owner = slot_owner AND expires_at > clock_timestamp();
      IF n >= cap THEN
        RETURN QUERY SELECT NULL::bigint, n, oldest;
        RETURN;
      END IF;
      DELETE FROM evaluation_slots WHERE owner = slot_owner AND expires_at <= clock_timestamp();
      RETURN QUERY
        INSERT INTO evaluation_slots (owner, expires_at)
        VALUES (slot_owner, clock_timestamp() + make_interval(secs => ttl_seconds))
        RETURNING id, 0, NULL::float8;
    END $$`);
};

export const down: MigrationFn<MigrationContext> = async ({ context: { sequelize } }) => {
  await sequelize.query('DROP FUNCTION take_evaluation_slot(text, integer, integer)');
};
