import { Migration } from '@mikro-orm/migrations';

export class Migration20261202055346 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "stock_item" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "nursery_id" int not null, "plant_taxon_id" int not null, "form" text check ("form" in ('plug', 'container', 'seed')) not null, "source_region" varchar(200) not null default '', "availability" text check ("availability" in ('now', 'season')) not null, "availability_note" varchar(200) not null default '', "grown_without_systemic_insecticides" boolean not null default false);`);
    this.addSql(`create index "stock_item_plant_taxon_id_index" on "stock_item" ("plant_taxon_id");`);
    this.addSql(`alter table "stock_item" add constraint "stock_item_nursery_taxon_form_unique" unique ("nursery_id", "plant_taxon_id", "form");`);

    this.addSql(`create table "planting_list" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "owner_id" int not null, "name" varchar(200) not null, "band" text check ("band" in ('north', 'south')) not null, "season_start" smallint not null, "season_end" smallint not null, "min_per_month" smallint not null, "size_limit" smallint null, "growth_forms" text[] not null default '{}', "native_only" boolean not null default true, "notes" text not null default '', "share_token" varchar(64) null);`);
    this.addSql(`create index "planting_list_owner_id_index" on "planting_list" ("owner_id");`);
    this.addSql(`alter table "planting_list" add constraint "planting_list_share_token_unique" unique ("share_token");`);

    this.addSql(`create table "planting_list_item" ("id" serial primary key, "list_id" int not null, "plant_taxon_id" int not null, "position" smallint not null, "reason" text not null default '');`);
    this.addSql(`create index "planting_list_item_plant_taxon_id_index" on "planting_list_item" ("plant_taxon_id");`);
    this.addSql(`alter table "planting_list_item" add constraint "planting_list_item_list_taxon_unique" unique ("list_id", "plant_taxon_id");`);

    this.addSql(`alter table "stock_item" add constraint "stock_item_nursery_id_foreign" foreign key ("nursery_id") references "app_user" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "stock_item" add constraint "stock_item_plant_taxon_id_foreign" foreign key ("plant_taxon_id") references "plant_taxon" ("id") on update cascade on delete restrict;`);

    this.addSql(`alter table "planting_list" add constraint "planting_list_owner_id_foreign" foreign key ("owner_id") references "app_user" ("id") on update cascade on delete cascade;`);

    this.addSql(`alter table "planting_list_item" add constraint "planting_list_item_list_id_foreign" foreign key ("list_id") references "planting_list" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "planting_list_item" add constraint "planting_list_item_plant_taxon_id_foreign" foreign key ("plant_taxon_id") references "plant_taxon" ("id") on update cascade on delete restrict;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "planting_list_item" drop constraint "planting_list_item_list_id_foreign";`);

    this.addSql(`drop table if exists "stock_item" cascade;`);

    this.addSql(`drop table if exists "planting_list" cascade;`);

    this.addSql(`drop table if exists "planting_list_item" cascade;`);
  }

}
