--
-- PostgreSQL database dump
--


-- Dumped from database version 15.18 (Debian 15.18-0+deb12u1)
-- Dumped by pg_dump version 15.18 (Debian 15.18-0+deb12u1)

SET statement_timeout = 0;
SET lock_timeout = 0;
SET idle_in_transaction_session_timeout = 0;
SET client_encoding = 'UTF8';
SET standard_conforming_strings = on;
SELECT pg_catalog.set_config('search_path', '', false);
SET check_function_bodies = false;
SET xmloption = content;
SET client_min_messages = warning;
SET row_security = off;

SET default_tablespace = '';

SET default_table_access_method = heap;

--
-- Name: catalog_meta; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.catalog_meta (
    key character varying(32) NOT NULL,
    value text NOT NULL
);


--
-- Name: import_batches; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.import_batches (
    id integer NOT NULL,
    file text NOT NULL,
    sha256 character varying(64) NOT NULL,
    imported_at character varying(32) NOT NULL,
    kind character varying(16) NOT NULL,
    rows integer NOT NULL,
    added integer NOT NULL,
    updated integer NOT NULL,
    unchanged integer NOT NULL,
    rejected integer NOT NULL
);


--
-- Name: import_batches_id_seq; Type: SEQUENCE; Schema: public; Owner: -
--

CREATE SEQUENCE public.import_batches_id_seq
    AS integer
    START WITH 1
    INCREMENT BY 1
    NO MINVALUE
    NO MAXVALUE
    CACHE 1;


--
-- Name: import_batches_id_seq; Type: SEQUENCE OWNED BY; Schema: public; Owner: -
--

ALTER SEQUENCE public.import_batches_id_seq OWNED BY public.import_batches.id;


--
-- Name: parts_capacitor; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.parts_capacitor (
    id integer NOT NULL,
    kind character varying(16) NOT NULL,
    manufacturer text NOT NULL,
    mpn text NOT NULL,
    description text,
    package text,
    unit_price double precision,
    stock integer,
    lifecycle text,
    capacitance_f double precision,
    tolerance double precision,
    voltage_v double precision,
    dielectric text,
    esr_ohm double precision,
    ripple_a double precision,
    temp_max_degc double precision,
    life_h double precision,
    length_mm double precision,
    width_mm double precision,
    height_mm double precision,
    extra text,
    source_line integer,
    batch_id integer
);


--
-- Name: parts_capacitor_id_seq; Type: SEQUENCE; Schema: public; Owner: -
--

CREATE SEQUENCE public.parts_capacitor_id_seq
    AS integer
    START WITH 1
    INCREMENT BY 1
    NO MINVALUE
    NO MAXVALUE
    CACHE 1;


--
-- Name: parts_capacitor_id_seq; Type: SEQUENCE OWNED BY; Schema: public; Owner: -
--

ALTER SEQUENCE public.parts_capacitor_id_seq OWNED BY public.parts_capacitor.id;


--
-- Name: parts_diode; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.parts_diode (
    id integer NOT NULL,
    kind character varying(16) NOT NULL,
    manufacturer text NOT NULL,
    mpn text NOT NULL,
    description text,
    package text,
    unit_price double precision,
    stock integer,
    lifecycle text,
    diode_type text,
    vrrm_v double precision,
    if_avg_a double precision,
    ifsm_a double precision,
    vf_v double precision,
    trr_s double precision,
    qrr_c double precision,
    tj_max_degc double precision,
    theta_ja_degc_w double precision,
    extra text,
    source_line integer,
    batch_id integer
);


--
-- Name: parts_diode_id_seq; Type: SEQUENCE; Schema: public; Owner: -
--

CREATE SEQUENCE public.parts_diode_id_seq
    AS integer
    START WITH 1
    INCREMENT BY 1
    NO MINVALUE
    NO MAXVALUE
    CACHE 1;


--
-- Name: parts_diode_id_seq; Type: SEQUENCE OWNED BY; Schema: public; Owner: -
--

ALTER SEQUENCE public.parts_diode_id_seq OWNED BY public.parts_diode.id;


--
-- Name: parts_inductor; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.parts_inductor (
    id integer NOT NULL,
    kind character varying(16) NOT NULL,
    manufacturer text NOT NULL,
    mpn text NOT NULL,
    description text,
    package text,
    unit_price double precision,
    stock integer,
    lifecycle text,
    inductance_h double precision,
    tolerance double precision,
    isat_a double precision,
    irms_a double precision,
    dcr_ohm double precision,
    srf_hz double precision,
    length_mm double precision,
    width_mm double precision,
    height_mm double precision,
    shielded boolean,
    extra text,
    source_line integer,
    batch_id integer
);


--
-- Name: parts_inductor_id_seq; Type: SEQUENCE; Schema: public; Owner: -
--

CREATE SEQUENCE public.parts_inductor_id_seq
    AS integer
    START WITH 1
    INCREMENT BY 1
    NO MINVALUE
    NO MAXVALUE
    CACHE 1;


--
-- Name: parts_inductor_id_seq; Type: SEQUENCE OWNED BY; Schema: public; Owner: -
--

ALTER SEQUENCE public.parts_inductor_id_seq OWNED BY public.parts_inductor.id;


--
-- Name: parts_mosfet; Type: TABLE; Schema: public; Owner: -
--

CREATE TABLE public.parts_mosfet (
    id integer NOT NULL,
    kind character varying(16) NOT NULL,
    manufacturer text NOT NULL,
    mpn text NOT NULL,
    description text,
    package text,
    unit_price double precision,
    stock integer,
    lifecycle text,
    channel text,
    vds_v double precision,
    id_a double precision,
    rds_on_ohm double precision,
    vgs_th_v double precision,
    qg_c double precision,
    qgd_c double precision,
    coss_f double precision,
    tj_max_degc double precision,
    theta_ja_degc_w double precision,
    extra text,
    source_line integer,
    batch_id integer
);


--
-- Name: parts_mosfet_id_seq; Type: SEQUENCE; Schema: public; Owner: -
--

CREATE SEQUENCE public.parts_mosfet_id_seq
    AS integer
    START WITH 1
    INCREMENT BY 1
    NO MINVALUE
    NO MAXVALUE
    CACHE 1;


--
-- Name: parts_mosfet_id_seq; Type: SEQUENCE OWNED BY; Schema: public; Owner: -
--

ALTER SEQUENCE public.parts_mosfet_id_seq OWNED BY public.parts_mosfet.id;


--
-- Name: import_batches id; Type: DEFAULT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.import_batches ALTER COLUMN id SET DEFAULT nextval('public.import_batches_id_seq'::regclass);


--
-- Name: parts_capacitor id; Type: DEFAULT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_capacitor ALTER COLUMN id SET DEFAULT nextval('public.parts_capacitor_id_seq'::regclass);


--
-- Name: parts_diode id; Type: DEFAULT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_diode ALTER COLUMN id SET DEFAULT nextval('public.parts_diode_id_seq'::regclass);


--
-- Name: parts_inductor id; Type: DEFAULT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_inductor ALTER COLUMN id SET DEFAULT nextval('public.parts_inductor_id_seq'::regclass);


--
-- Name: parts_mosfet id; Type: DEFAULT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_mosfet ALTER COLUMN id SET DEFAULT nextval('public.parts_mosfet_id_seq'::regclass);


--
-- Data for Name: catalog_meta; Type: TABLE DATA; Schema: public; Owner: -
--

INSERT INTO public.catalog_meta VALUES ('db_uuid', '526ce06252ab497ab9c34176b223b341');
INSERT INTO public.catalog_meta VALUES ('schema_version', '4');
INSERT INTO public.catalog_meta VALUES ('generation', '2');
INSERT INTO public.catalog_meta VALUES ('generation.inductor', '1');
INSERT INTO public.catalog_meta VALUES ('generation.capacitor', '1');


--
-- Data for Name: import_batches; Type: TABLE DATA; Schema: public; Owner: -
--

INSERT INTO public.import_batches VALUES (1, '/work/wt/i13/tests/data/catalog/inductors_small.csv', 'd31a0588a984720a7b37df5a1beeceec4367a2034f7041635718ded5fe9c6c12', '2026-12-02T14:44:16+00:00', 'inductor', 6, 6, 0, 0, 0);
INSERT INTO public.import_batches VALUES (2, '/work/wt/i13/tests/data/catalog/capacitors_small.csv', '008d84b5de3c3fb53a6841ef9feb03b6f83fcc8eb7cd03d79864e7f4483cf300', '2026-12-02T14:44:16+00:00', 'capacitor', 4, 4, 0, 0, 0);


--
-- Data for Name: parts_capacitor; Type: TABLE DATA; Schema: public; Owner: -
--

INSERT INTO public.parts_capacitor VALUES (1, 'capacitor', 'Orrin Ceramics', 'OR-106-X7R-50', NULL, NULL, 0.21, NULL, NULL, 9.999999999999999e-06, NULL, 50, 'x7r', 0.005, 3, 125, NULL, NULL, NULL, NULL, NULL, 2, 2);
INSERT INTO public.parts_capacitor VALUES (2, 'capacitor', 'Orrin Ceramics', 'OR-104-C0G-100', NULL, NULL, 0.08, NULL, NULL, 1.0000000000000001e-07, NULL, 100, 'c0g', 0.012, 1, 125, NULL, NULL, NULL, NULL, NULL, 3, 2);
INSERT INTO public.parts_capacitor VALUES (3, 'capacitor', 'Vellum Electrolytics', 'VL-221-AE-35', NULL, NULL, 0.18, NULL, NULL, 0.00021999999999999998, NULL, 35, 'al-electrolytic', 0.15, 0.9, 105, 2000, NULL, NULL, NULL, NULL, 4, 2);
INSERT INTO public.parts_capacitor VALUES (4, 'capacitor', 'Vellum Electrolytics', 'VL-330-TA-16', NULL, NULL, 0.95, NULL, NULL, 0.00033, NULL, 16, 'ta-mno2', 0.1, 1.4, 125, NULL, NULL, NULL, NULL, NULL, 5, 2);


--
-- Data for Name: parts_diode; Type: TABLE DATA; Schema: public; Owner: -
--



--
-- Data for Name: parts_inductor; Type: TABLE DATA; Schema: public; Owner: -
--

INSERT INTO public.parts_inductor VALUES (1, 'inductor', 'Quillmark Magnetics', 'QM-1R0-0630', 'Shielded power choke 1.0 uH', '0630', 0.31, 5200, 'active', 1e-06, 0.2, 9.5, 8, 0.0085, 90000000, 7, 6.6, 3, true, NULL, 2, 1);
INSERT INTO public.parts_inductor VALUES (2, 'inductor', 'Quillmark Magnetics', 'QM-2R2-0630', 'Shielded power choke 2.2 uH', '0630', 0.31, 4100, 'active', 2.2e-06, 0.2, 6.8, 6, 0.016, 60000000, 7, 6.6, 3, true, NULL, 3, 1);
INSERT INTO public.parts_inductor VALUES (3, 'inductor', 'Quillmark Magnetics', 'QM-4R7-0630', 'Shielded power choke 4.7 uH', '0630', 0.32, 3900, 'active', 4.7e-06, 0.2, 4.6, 4.2, 0.032, 38000000, 7, 6.6, 3, true, NULL, 4, 1);
INSERT INTO public.parts_inductor VALUES (4, 'inductor', 'Quillmark Magnetics', 'QM-100-0630', 'Shielded power choke 10 uH', '0630', 0.33, 2600, 'nrnd', 9.999999999999999e-06, 0.2, 3.1, 2.8, 0.068, 25000000, 7, 6.6, 3, true, NULL, 5, 1);
INSERT INTO public.parts_inductor VALUES (5, 'inductor', 'Quillmark Magnetics', 'QM-220-1040', 'Shielded power choke 22 uH', '1040', 0.48, 900, 'active', 2.2e-05, 0.2, 4.4, 3.9, 0.055, 14000000, 10.5, 10, 4, true, NULL, 6, 1);
INSERT INTO public.parts_inductor VALUES (6, 'inductor', 'Brindle Toroids', 'BT-470-0805U', 'Unshielded drum core 47 uH', '0805', 0.27, NULL, 'obsolete', 4.7e-05, 0.1, 1.9, 1.6, 0.21, NULL, 8, 8, 5, false, NULL, 7, 1);


--
-- Data for Name: parts_mosfet; Type: TABLE DATA; Schema: public; Owner: -
--



--
-- Name: import_batches_id_seq; Type: SEQUENCE SET; Schema: public; Owner: -
--

SELECT pg_catalog.setval('public.import_batches_id_seq', 2, true);


--
-- Name: parts_capacitor_id_seq; Type: SEQUENCE SET; Schema: public; Owner: -
--

SELECT pg_catalog.setval('public.parts_capacitor_id_seq', 4, true);


--
-- Name: parts_diode_id_seq; Type: SEQUENCE SET; Schema: public; Owner: -
--

SELECT pg_catalog.setval('public.parts_diode_id_seq', 1, false);


--
-- Name: parts_inductor_id_seq; Type: SEQUENCE SET; Schema: public; Owner: -
--

SELECT pg_catalog.setval('public.parts_inductor_id_seq', 6, true);


--
-- Name: parts_mosfet_id_seq; Type: SEQUENCE SET; Schema: public; Owner: -
--

SELECT pg_catalog.setval('public.parts_mosfet_id_seq', 1, false);


--
-- Name: catalog_meta catalog_meta_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.catalog_meta
    ADD CONSTRAINT catalog_meta_pkey PRIMARY KEY (key);


--
-- Name: import_batches import_batches_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.import_batches
    ADD CONSTRAINT import_batches_pkey PRIMARY KEY (id);


--
-- Name: parts_capacitor parts_capacitor_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_capacitor
    ADD CONSTRAINT parts_capacitor_pkey PRIMARY KEY (id);


--
-- Name: parts_diode parts_diode_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_diode
    ADD CONSTRAINT parts_diode_pkey PRIMARY KEY (id);


--
-- Name: parts_inductor parts_inductor_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_inductor
    ADD CONSTRAINT parts_inductor_pkey PRIMARY KEY (id);


--
-- Name: parts_mosfet parts_mosfet_pkey; Type: CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_mosfet
    ADD CONSTRAINT parts_mosfet_pkey PRIMARY KEY (id);


--
-- Name: uq_capacitor_identity; Type: INDEX; Schema: public; Owner: -
--

CREATE UNIQUE INDEX uq_capacitor_identity ON public.parts_capacitor USING btree (mpn, manufacturer);


--
-- Name: uq_diode_identity; Type: INDEX; Schema: public; Owner: -
--

CREATE UNIQUE INDEX uq_diode_identity ON public.parts_diode USING btree (mpn, manufacturer);


--
-- Name: uq_inductor_identity; Type: INDEX; Schema: public; Owner: -
--

CREATE UNIQUE INDEX uq_inductor_identity ON public.parts_inductor USING btree (mpn, manufacturer);


--
-- Name: uq_mosfet_identity; Type: INDEX; Schema: public; Owner: -
--

CREATE UNIQUE INDEX uq_mosfet_identity ON public.parts_mosfet USING btree (mpn, manufacturer);


--
-- Name: parts_capacitor parts_capacitor_batch_id_fkey; Type: FK CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_capacitor
    ADD CONSTRAINT parts_capacitor_batch_id_fkey FOREIGN KEY (batch_id) REFERENCES public.import_batches(id);


--
-- Name: parts_diode parts_diode_batch_id_fkey; Type: FK CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_diode
    ADD CONSTRAINT parts_diode_batch_id_fkey FOREIGN KEY (batch_id) REFERENCES public.import_batches(id);


--
-- Name: parts_inductor parts_inductor_batch_id_fkey; Type: FK CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_inductor
    ADD CONSTRAINT parts_inductor_batch_id_fkey FOREIGN KEY (batch_id) REFERENCES public.import_batches(id);


--
-- Name: parts_mosfet parts_mosfet_batch_id_fkey; Type: FK CONSTRAINT; Schema: public; Owner: -
--

ALTER TABLE ONLY public.parts_mosfet
    ADD CONSTRAINT parts_mosfet_batch_id_fkey FOREIGN KEY (batch_id) REFERENCES public.import_batches(id);


--
-- PostgreSQL database dump complete
--


