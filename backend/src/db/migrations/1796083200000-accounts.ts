// First schema: accounts, clubs, memberships with per-club roles, invitations, and the table
// connect-pg-simple keeps sessions in (its own layout, from the package's table.sql).
// Entity tables were generated from the entities with TypeORM's schema builder, so the drift test
// (tests/api/migrations.test.ts) starts from zero difference.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Accounts1796083200000 implements MigrationInterface {
  name = 'Accounts1796083200000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TYPE "public"."unit_system" AS ENUM('imperial', 'metric')`);
    await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "email" character varying(320) NOT NULL, "display_name" character varying(120) NOT NULL, "password_hash" character varying(255), "preferred_units" "public"."unit_system" NOT NULL DEFAULT 'imperial', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_97672ac88f789774dd47f7c8be3" UNIQUE ("email"), CONSTRAINT "CHK_users_email_lower_case" CHECK ("email" = lower("email")), CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "memberships" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "user_id" uuid NOT NULL, "club_id" uuid NOT NULL, "roles" text array NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_memberships_user_club" UNIQUE ("user_id", "club_id"), CONSTRAINT "CHK_memberships_roles" CHECK (cardinality("roles") > 0 AND "roles" <@ ARRAY['builder', 'steward', 'admin']::text[]), CONSTRAINT "PK_25d28bd932097a9e90495ede7b4" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "clubs" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "slug" character varying(80) NOT NULL, "name" character varying(200) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_11a81774605896dbb29c9e53605" UNIQUE ("slug"), CONSTRAINT "PK_bb09bd0c8d5238aeaa8f86ee0d4" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "invitations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "token_hash" character(64) NOT NULL, "email" character varying(320) NOT NULL, "club_id" uuid NOT NULL, "roles" text array NOT NULL, "invited_by" uuid, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "accepted_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_872ac94a64b3d44fc4b554780cd" UNIQUE ("token_hash"), CONSTRAINT "CHK_invitations_roles" CHECK (cardinality("roles") > 0 AND "roles" <@ ARRAY['builder', 'steward', 'admin']::text[]), CONSTRAINT "PK_5dec98cfdfd562e4ad3648bbb07" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_invitations_club_email" ON "invitations"  ("club_id", "email") `);
    await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_876414d7f41f3c6f07c3354caed" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "invitations" ADD CONSTRAINT "FK_54dca5b29a692647e49a40d9754" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "invitations" ADD CONSTRAINT "FK_29b1cef6891d9b9d4e35f793b81" FOREIGN KEY ("invited_by") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    // Sessions (connect-pg-simple); not an entity, so the schema builder leaves it alone.
    await queryRunner.query(`CREATE TABLE "session" ("sid" character varying NOT NULL COLLATE "default", "sess" json NOT NULL, "expire" TIMESTAMP(6) NOT NULL, CONSTRAINT "session_pkey" PRIMARY KEY ("sid"))`);
    await queryRunner.query(`CREATE INDEX "IDX_session_expire" ON "session" ("expire")`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "public"."IDX_session_expire"`);
    await queryRunner.query(`DROP TABLE "session"`);
    await queryRunner.query(`ALTER TABLE "invitations" DROP CONSTRAINT "FK_29b1cef6891d9b9d4e35f793b81"`);
    await queryRunner.query(`ALTER TABLE "invitations" DROP CONSTRAINT "FK_54dca5b29a692647e49a40d9754"`);
    await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_876414d7f41f3c6f07c3354caed"`);
    await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_invitations_club_email"`);
    await queryRunner.query(`DROP TABLE "invitations"`);
    await queryRunner.query(`DROP TABLE "clubs"`);
    await queryRunner.query(`DROP TABLE "memberships"`);
    await queryRunner.query(`DROP TABLE "users"`);
    await queryRunner.query(`DROP TYPE "public"."unit_system"`);
  }
}
