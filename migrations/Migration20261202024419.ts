import { Migration } from '@mikro-orm/migrations';

export class Migration20261202024419 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "site" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "name" varchar(200) not null, "decimal_latitude" double precision not null, "decimal_longitude" double precision not null, "coordinate_uncertainty_in_meters" int not null default 100, "habitat" varchar(300) not null default '', "iso_region_code" varchar(10) not null default '');`);
    this.addSql(`alter table "site" add constraint "site_name_unique" unique ("name");`);

    this.addSql(`create table "visit" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "recorder_id" int not null, "client_submission_id" uuid not null, "event_date" timestamptz not null, "event_local_date" date not null, "event_time_zone" varchar(64) not null default '', "decimal_latitude" double precision not null, "decimal_longitude" double precision not null, "coordinate_uncertainty_in_meters" int null, "site_id" int null, "behavior" text check ("behavior" in ('nectar_foraging', 'pollen_collecting', 'nest_searching', 'resting', 'other')) not null, "habitat_notes" text not null default '', "occurrence_remarks" text not null default '', "bee_identification_confidence" text check ("bee_identification_confidence" in ('certain', 'probable', 'unsure')) not null, "plant_taxon_id" int null, "plant_status" text check ("plant_status" in ('proposed', 'confirmed', 'corrected', 'cannot_be_determined')) not null, "bee_taxon_id" int null, "caste" text check ("caste" in ('queen', 'worker', 'male', 'unknown')) not null, "bee_status" text check ("bee_status" in ('proposed', 'confirmed', 'corrected', 'cannot_be_determined')) not null, "version" int not null default 1);`);
    this.addSql(`create index "visit_event_date_index" on "visit" ("event_date");`);
    this.addSql(`create index "visit_site_id_index" on "visit" ("site_id");`);
    this.addSql(`create index "visit_plant_taxon_id_index" on "visit" ("plant_taxon_id");`);
    this.addSql(`create index "visit_bee_taxon_id_index" on "visit" ("bee_taxon_id");`);
    this.addSql(`create index "visit_recorder_event_index" on "visit" ("recorder_id", "event_date");`);
    this.addSql(`alter table "visit" add constraint "visit_recorder_submission_unique" unique ("recorder_id", "client_submission_id");`);

    this.addSql(`create table "photo" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "visit_id" int not null, "subject" text check ("subject" in ('bee', 'plant')) not null, "storage_key" varchar(300) not null, "content_type" varchar(50) not null, "byte_size" int not null, "views" text[] not null default '{}');`);
    this.addSql(`create index "photo_visit_id_index" on "photo" ("visit_id");`);
    this.addSql(`alter table "photo" add constraint "photo_storage_key_unique" unique ("storage_key");`);

    this.addSql(`create table "determination" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "visit_id" int not null, "subject" text check ("subject" in ('bee', 'plant')) not null, "plant_taxon_id" int null, "bee_taxon_id" int null, "caste" text check ("caste" in ('queen', 'worker', 'male', 'unknown')) null, "identification_qualifier" varchar(20) not null default '', "identified_by_id" int not null, "date_identified" timestamptz not null, "status" text check ("status" in ('proposed', 'confirmed', 'corrected', 'cannot_be_determined')) not null, "remarks" text not null default '');`);
    this.addSql(`create index "determination_visit_id_index" on "determination" ("visit_id");`);

    this.addSql(`alter table "visit" add constraint "visit_recorder_id_foreign" foreign key ("recorder_id") references "app_user" ("id") on update cascade on delete restrict;`);
    this.addSql(`alter table "visit" add constraint "visit_site_id_foreign" foreign key ("site_id") references "site" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "visit" add constraint "visit_plant_taxon_id_foreign" foreign key ("plant_taxon_id") references "plant_taxon" ("id") on update cascade on delete restrict;`);
    this.addSql(`alter table "visit" add constraint "visit_bee_taxon_id_foreign" foreign key ("bee_taxon_id") references "bee_taxon" ("id") on update cascade on delete restrict;`);

    this.addSql(`alter table "photo" add constraint "photo_visit_id_foreign" foreign key ("visit_id") references "visit" ("id") on update cascade on delete cascade;`);

    this.addSql(`alter table "determination" add constraint "determination_visit_id_foreign" foreign key ("visit_id") references "visit" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "determination" add constraint "determination_plant_taxon_id_foreign" foreign key ("plant_taxon_id") references "plant_taxon" ("id") on update cascade on delete restrict;`);
    this.addSql(`alter table "determination" add constraint "determination_bee_taxon_id_foreign" foreign key ("bee_taxon_id") references "bee_taxon" ("id") on update cascade on delete restrict;`);
    this.addSql(`alter table "determination" add constraint "determination_identified_by_id_foreign" foreign key ("identified_by_id") references "app_user" ("id") on update cascade on delete restrict;`);

  }

  override async down(): Promise<void> {
    this.addSql(`alter table "visit" drop constraint "visit_site_id_foreign";`);

    this.addSql(`alter table "photo" drop constraint "photo_visit_id_foreign";`);

    this.addSql(`alter table "determination" drop constraint "determination_visit_id_foreign";`);

    this.addSql(`drop table if exists "site" cascade;`);

    this.addSql(`drop table if exists "visit" cascade;`);

    this.addSql(`drop table if exists "photo" cascade;`);

    this.addSql(`drop table if exists "determination" cascade;`);

  }

}
