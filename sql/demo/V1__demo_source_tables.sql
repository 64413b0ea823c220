-- Source table of the demo survey: the Harrowmere County Household Living Conditions Survey (invented).
-- One row per household interview; all waves share the table and the wave column tells them apart.
-- Load a wave with:
--   COPY survey_demo.household_wave FROM STDIN (FORMAT csv, HEADER true)
-- In that format an unquoted empty field is NULL and "" is the empty string; the demo data use both.
-- Columns are deliberately loose (text codes, no CHECK constraints): the monitor, not the table, is meant to
-- notice sentinel values, blank answers and changed code frames.

CREATE SCHEMA IF NOT EXISTS survey_demo;

CREATE TABLE survey_demo.household_wave (
    wave                 text     NOT NULL,  -- e.g. '2024-Q3'; labels sort in time order
    respondent_id        bigint   NOT NULL,  -- household id, unique across waves
    interview_mode       text,               -- web | telephone | in_person
    district             text,               -- GUL SAL BRN TID MOR KES
    age                  smallint,           -- years, 16..95, of the person answering
    height_cm            smallint,           -- measured height of the person answering, whole cm
    income_monthly       integer,            -- net household income per month; -9 = refused (codebook)
    commute_minutes      smallint,           -- one-way journey to work; NULL when not commuting
    housing_satisfaction smallint,           -- 1 very dissatisfied .. 5 very satisfied
    life_satisfaction    smallint,           -- 0 not at all .. 10 completely
    heating_fuel         text,               -- GAS OIL ELEC HPUMP SOLID LPG
    tenure               text,               -- OWN MORT PRIV COUN FREE (HASS from 2025-Q2)
    has_broadband        text,               -- yes | no
    owns_boat            smallint,           -- 0 | 1
    children             smallint,           -- children under 16 in the household
    occupation           text,               -- free text, as typed
    move_in_date         date,               -- date the household moved into the current home
    mooring_fee          integer,            -- annual mooring fee, boat owners only; NULL otherwise
    interviewer_id       text,               -- field interviewer, H01..H30 (H01..H60 in the booster wave)
    water_pressure_low   text,               -- yes | no: tap pressure often too low
    neighbourhood_safe   smallint,           -- 1 very unsafe .. 5 very safe walking after dark
    heating_hours        smallint,           -- hours a week the heating runs, this quarter
    PRIMARY KEY (wave, respondent_id)
);

COMMENT ON TABLE survey_demo.household_wave IS
    'Harrowmere County Household Living Conditions Survey (invented demo data), one row per interview';
