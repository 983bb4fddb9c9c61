import { Migration } from '@mikro-orm/migrations';

export class Migration20261202031417 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table "app_user" add column "notice_preference" text check ("notice_preference" in ('each', 'daily_digest', 'none')) not null default 'each', add column "last_digest_at" timestamptz null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "app_user" drop column "notice_preference", drop column "last_digest_at";`);
  }

}
