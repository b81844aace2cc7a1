// Password resets by e-mail (docs/api.md, "Authentication and account"): the SHA-256 of each link's
// token, its user, when it expires (an hour) and when it was used. Generated from the entity with
// TypeORM's schema builder, so the drift test starts from zero difference.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class PasswordResets1796198100000 implements MigrationInterface {
  name = 'PasswordResets1796198100000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "password_resets" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "token_hash" character(64) NOT NULL, "user_id" uuid NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_323290a9239ad3d397ad78018ec" UNIQUE ("token_hash"), CONSTRAINT "PK_4816377aa98211c1de34469e742" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_password_resets_user" ON "password_resets"  ("user_id") `);
    await queryRunner.query(`ALTER TABLE "password_resets" ADD CONSTRAINT "FK_f7a4c3bc48f24df007936d217be" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "password_resets" DROP CONSTRAINT "FK_f7a4c3bc48f24df007936d217be"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_password_resets_user"`);
    await queryRunner.query(`DROP TABLE "password_resets"`);
  }
}
