import { Migration } from '@mikro-orm/migrations';

export class Migration20261202023038 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "programme_setting" ("key" varchar(100) not null, "value" jsonb not null, "updated_at" timestamptz not null, constraint "programme_setting_pkey" primary key ("key"));`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "programme_setting" cascade;`);
  }

}
