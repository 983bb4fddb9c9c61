import { Migration } from '@mikro-orm/migrations';

export class Migration20261202050922 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "forage_count" ("id" bigserial primary key, "caste" varchar(10) not null, "season" varchar(20) not null, "band" varchar(5) not null, "evidence" varchar(10) not null, "year" smallint not null, "month" smallint not null, "bee_taxon_id" int not null, "plant_taxon_id" int not null, "site_key" varchar(24) not null, "recorder_id" int not null, "visits" int not null);`);
    this.addSql(`create index "forage_count_plant_taxon_id_index" on "forage_count" ("plant_taxon_id");`);
    this.addSql(`alter table "forage_count" add constraint "forage_count_key" unique ("caste", "season", "band", "evidence", "year", "month", "bee_taxon_id", "plant_taxon_id", "site_key", "recorder_id");`);

    this.addSql(`create table "season_window" ("id" serial primary key, "band" text check ("band" in ('north', 'south')) not null, "name" text check ("name" in ('early-spring', 'second-wave', 'overwinter')) not null, "start" varchar(5) not null, "end" varchar(5) not null, "updated_at" timestamptz not null);`);
    this.addSql(`alter table "season_window" add constraint "season_window_band_name_unique" unique ("band", "name");`);

    this.addSql(`create table "floral_count" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "site_id" int not null, "survey_date" date not null, "plant_taxon_id" int not null, "flowering_units" int not null, "recorded_by_id" int not null, "remarks" text not null default '', constraint floral_count_units_check check ((flowering_units >= 0)));`);
    this.addSql(`create index "floral_count_survey_date_index" on "floral_count" ("survey_date");`);
    this.addSql(`create index "floral_count_plant_taxon_id_index" on "floral_count" ("plant_taxon_id");`);
    this.addSql(`alter table "floral_count" add constraint "floral_count_site_date_taxon_unique" unique ("site_id", "survey_date", "plant_taxon_id");`);

    this.addSql(`alter table "floral_count" add constraint "floral_count_site_id_foreign" foreign key ("site_id") references "site" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "floral_count" add constraint "floral_count_plant_taxon_id_foreign" foreign key ("plant_taxon_id") references "plant_taxon" ("id") on update cascade on delete restrict;`);
    this.addSql(`alter table "floral_count" add constraint "floral_count_recorded_by_id_foreign" foreign key ("recorded_by_id") references "app_user" ("id") on update cascade on delete restrict;`);

    // The rules that file a visit in the rollup, as SQL functions so the trigger, the rebuild
    // and the benchmark's naive query share them (app/forage/seasons.ts states them in TypeScript).
    this.addSql(`create or replace function forage_band(latitude double precision) returns text
      language sql immutable parallel safe as $$ select case when latitude >= 42.0 then 'north' else 'south' end $$;`);
    this.addSql(`create or replace function forage_month_day(value text) returns int
      language sql immutable parallel safe as $$ select substr(value, 1, 2)::int * 100 + substr(value, 4, 2)::int $$;`);
    this.addSql(`create or replace function forage_season(band text, local_date date) returns text
      language sql stable parallel safe as $$
        select coalesce((
          select w.name from season_window w
          where w.band = forage_season.band
            and case when forage_month_day(w.start) <= forage_month_day(w."end")
              then extract(month from local_date)::int * 100 + extract(day from local_date)::int between forage_month_day(w.start) and forage_month_day(w."end")
              else extract(month from local_date)::int * 100 + extract(day from local_date)::int >= forage_month_day(w.start)
                or extract(month from local_date)::int * 100 + extract(day from local_date)::int <= forage_month_day(w."end")
            end
          limit 1), '') $$;`);
    // Evidence: confirmed when both determinations are confirmed or corrected; a visit whose
    // plant or bee cannot be determined, or that has no plant, is no evidence at all (null).
    this.addSql(`create or replace function forage_evidence(plant_status text, bee_status text) returns text
      language sql immutable parallel safe as $$
        select case
          when plant_status = 'cannot_be_determined' or bee_status = 'cannot_be_determined' then null
          when plant_status in ('confirmed', 'corrected') and bee_status in ('confirmed', 'corrected') then 'confirmed'
          else 'proposed' end $$;`);
    this.addSql(`create or replace function forage_site_key(site_id int, latitude double precision, longitude double precision) returns text
      language sql immutable parallel safe as $$
        select case when site_id is not null then 's' || site_id
          else 'g' || floor(latitude * 100)::bigint || ':' || floor(longitude * 100)::bigint end $$;`);

    this.addSql(`create or replace function forage_count_apply(v visit, delta int) returns void language plpgsql as $$
      declare
        b text := forage_band(v.decimal_latitude);
        ev text := forage_evidence(v.plant_status::text, v.bee_status::text);
        k_season text := forage_season(b, v.event_local_date);
        k_site text := forage_site_key(v.site_id, v.decimal_latitude, v.decimal_longitude);
      begin
        if v.plant_taxon_id is null or ev is null then return; end if;
        insert into forage_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, visits)
        values (v.caste::text, k_season, b, ev, extract(year from v.event_local_date)::int, extract(month from v.event_local_date)::int,
                coalesce(v.bee_taxon_id, 0), v.plant_taxon_id, k_site, v.recorder_id, delta)
        on conflict on constraint forage_count_key do update set visits = forage_count.visits + excluded.visits;
        if delta < 0 then
          delete from forage_count
          where caste = v.caste::text and season = k_season and band = b and evidence = ev
            and year = extract(year from v.event_local_date)::int and month = extract(month from v.event_local_date)::int
            and bee_taxon_id = coalesce(v.bee_taxon_id, 0) and plant_taxon_id = v.plant_taxon_id
            and site_key = k_site and recorder_id = v.recorder_id and visits <= 0;
        end if;
      end $$;`);

    this.addSql(`create or replace function forage_count_on_visit() returns trigger language plpgsql as $$
      begin
        if tg_op in ('UPDATE', 'DELETE') then perform forage_count_apply(old, -1); end if;
        if tg_op in ('UPDATE', 'INSERT') then perform forage_count_apply(new, 1); end if;
        return null;
      end $$;`);
    this.addSql(`create trigger forage_count_on_visit_insert_delete after insert or delete on visit
      for each row execute function forage_count_on_visit();`);
    // Only changes to what the rollup files a visit by; an edit of the remarks costs nothing.
    this.addSql(`create trigger forage_count_on_visit_update after update on visit
      for each row when (
        old.plant_taxon_id is distinct from new.plant_taxon_id or old.bee_taxon_id is distinct from new.bee_taxon_id
        or old.caste is distinct from new.caste or old.plant_status is distinct from new.plant_status
        or old.bee_status is distinct from new.bee_status or old.event_local_date is distinct from new.event_local_date
        or old.decimal_latitude is distinct from new.decimal_latitude or old.decimal_longitude is distinct from new.decimal_longitude
        or old.site_id is distinct from new.site_id or old.recorder_id is distinct from new.recorder_id)
      execute function forage_count_on_visit();`);

    // The whole rollup from the visits, for the first time here and whenever windows change.
    this.addSql(`create or replace function forage_count_rebuild() returns void language plpgsql as $$
      begin
        lock table visit in share mode;
        delete from forage_count;
        insert into forage_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, visits)
        select caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, count(*)
        from (
          select v.caste::text as caste, forage_season(forage_band(v.decimal_latitude), v.event_local_date) as season,
                 forage_band(v.decimal_latitude) as band, forage_evidence(v.plant_status::text, v.bee_status::text) as evidence,
                 extract(year from v.event_local_date)::int as year, extract(month from v.event_local_date)::int as month,
                 coalesce(v.bee_taxon_id, 0) as bee_taxon_id, v.plant_taxon_id,
                 forage_site_key(v.site_id, v.decimal_latitude, v.decimal_longitude) as site_key, v.recorder_id
          from visit v where v.plant_taxon_id is not null
        ) filed
        where evidence is not null
        group by caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id;
      end $$;`);

    this.addSql(`insert into season_window (band, name, start, "end", updated_at) values
      ('south', 'early-spring', '04-01', '05-31', now()), ('south', 'second-wave', '08-01', '09-30', now()), ('south', 'overwinter', '10-01', '03-31', now()),
      ('north', 'early-spring', '04-20', '05-31', now()), ('north', 'second-wave', '08-01', '09-30', now()), ('north', 'overwinter', '10-01', '03-31', now());`);
    this.addSql(`select forage_count_rebuild();`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop trigger if exists forage_count_on_visit_insert_delete on visit;`);
    this.addSql(`drop trigger if exists forage_count_on_visit_update on visit;`);
    this.addSql(`drop function if exists forage_count_on_visit(), forage_count_apply(visit, int), forage_count_rebuild(), forage_season(text, date), forage_evidence(text, text), forage_site_key(int, double precision, double precision), forage_month_day(text), forage_band(double precision);`);
    this.addSql(`drop table if exists "forage_count" cascade;`);

    this.addSql(`drop table if exists "season_window" cascade;`);

    this.addSql(`drop table if exists "floral_count" cascade;`);
  }

}
