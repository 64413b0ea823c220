-- Source table of the demo's second dataset: the Harrowmere Household Panel (invented), the same households of the
-- same county re-interviewed every quarter. One row per household interview and release; all waves share the table,
-- the wave column tells them apart and the revision column numbers the publications of a wave (2025-Q2 was
-- published twice). Load a wave, both of its releases in one file, with:
--   COPY survey_demo.panel_wave FROM STDIN (FORMAT csv, HEADER true)
-- The sample is stratified by district and clustered in villages (the primary sampling units); the weight is
-- calibrated to the county register's households per district.

CREATE SCHEMA IF NOT EXISTS survey_demo;

CREATE TABLE survey_demo.panel_wave (
    wave                 text          NOT NULL,  -- e.g. '2025-Q1'; labels sort in time order
    revision             smallint      NOT NULL,  -- publication of the wave: 1, then 2 for a revised release
    household_id         bigint        NOT NULL,  -- the same household keeps its id in every wave
    district             text          NOT NULL,  -- stratum: GUL SAL BRN TID MOR KES
    village              text          NOT NULL,  -- primary sampling unit, e.g. 'BRN-03', nested in its district
    weight               numeric(10,3),           -- calibrated weight: households of the county it stands for
    household_size       smallint,                -- people living in the household, 1..6 (6: six or more)
    rooms                smallint,                -- rooms of the home, kitchen and bathrooms not counted
    employment_status    text,                    -- reference person: EMP SELF UNEMP INACT RETD
    hours_worked         smallint,                -- reference person's usual weekly hours; NULL when not working
    income_monthly       integer,                 -- net household income per month
    energy_bill          integer,                 -- household energy bill per month
    life_satisfaction    smallint,                -- 0 not at all .. 10 completely
    mains_gas            text,                    -- yes | no: the home is on the gas grid
    water_outage         text,                    -- yes | no: water supply cut for 12 hours or more in the quarter
    fuel_support         smallint,                -- 0 | 1: the household receives the county's fuel support
    PRIMARY KEY (wave, revision, household_id)
);

COMMENT ON TABLE survey_demo.panel_wave IS
    'Harrowmere Household Panel (invented demo data), one row per household interview and release';
