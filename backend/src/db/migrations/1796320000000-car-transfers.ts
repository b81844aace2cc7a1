// Car transfers (issue 13 §3): a seller's offer to a buyer of the same club, its answer, and a club
// admin's outright move, one row each; at most one open offer per car. Written from the schema builder's
// own statements for the entity (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class CarTransfers1796320000000 implements MigrationInterface {
  name = 'CarTransfers1796320000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      `CREATE TABLE "car_transfers" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "car_id" uuid NOT NULL, "from_user_id" uuid NOT NULL, "to_user_id" uuid NOT NULL, "state" character varying(20) NOT NULL, "by_admin_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "decided_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "CHK_car_transfers_people" CHECK ("from_user_id" <> "to_user_id"), CONSTRAINT "CHK_car_transfers_state" CHECK ("state" IN ('offered', 'accepted', 'declined', 'withdrawn', 'cancelled', 'transferred')), CONSTRAINT "PK_car_transfers" PRIMARY KEY ("id"))`,
    );
    await queryRunner.query(`CREATE INDEX "IDX_car_transfers_from" ON "car_transfers"  ("from_user_id", "state") `);
    await queryRunner.query(`CREATE INDEX "IDX_car_transfers_to" ON "car_transfers"  ("to_user_id", "state") `);
    await queryRunner.query(`CREATE UNIQUE INDEX "UQ_car_transfers_open_offer" ON "car_transfers"  ("car_id") WHERE "state" = 'offered'`);
    await queryRunner.query(`ALTER TABLE "car_transfers" ADD CONSTRAINT "FK_car_transfers_car" FOREIGN KEY ("car_id") REFERENCES "cars"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "car_transfers" ADD CONSTRAINT "FK_car_transfers_from" FOREIGN KEY ("from_user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "car_transfers" ADD CONSTRAINT "FK_car_transfers_to" FOREIGN KEY ("to_user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "car_transfers" ADD CONSTRAINT "FK_car_transfers_admin" FOREIGN KEY ("by_admin_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "car_transfers"`);
  }
}
