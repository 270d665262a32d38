PRAGMA foreign_keys=OFF;
BEGIN TRANSACTION;
CREATE TABLE import_batches (
	id INTEGER NOT NULL, 
	file TEXT NOT NULL, 
	sha256 VARCHAR(64) NOT NULL, 
	imported_at VARCHAR(32) NOT NULL, 
	kind VARCHAR(16) NOT NULL, 
	rows INTEGER NOT NULL, 
	added INTEGER NOT NULL, 
	updated INTEGER NOT NULL, 
	unchanged INTEGER NOT NULL, 
	rejected INTEGER NOT NULL, 
	PRIMARY KEY (id)
);
INSERT INTO import_batches VALUES(1,'/work/wt/i13/tests/data/catalog/inductors_small.csv','d31a0588a984720a7b37df5a1beeceec4367a2034f7041635718ded5fe9c6c12','2026-12-02T14:44:16+00:00','inductor',6,6,0,0,0);
INSERT INTO import_batches VALUES(2,'/work/wt/i13/tests/data/catalog/capacitors_small.csv','008d84b5de3c3fb53a6841ef9feb03b6f83fcc8eb7cd03d79864e7f4483cf300','2026-12-02T14:44:16+00:00','capacitor',4,4,0,0,0);
CREATE TABLE catalog_meta (
	"key" VARCHAR(32) NOT NULL, 
	value TEXT NOT NULL, 
	PRIMARY KEY ("key")
);
INSERT INTO catalog_meta VALUES('generation','2');
INSERT INTO catalog_meta VALUES('db_uuid','c731fea0264d43ebb06771cb9f3bfb2c');
INSERT INTO catalog_meta VALUES('schema_version','4');
INSERT INTO catalog_meta VALUES('generation.inductor','1');
INSERT INTO catalog_meta VALUES('generation.capacitor','1');
CREATE TABLE parts_inductor (
	id INTEGER NOT NULL, 
	kind VARCHAR(16) NOT NULL, 
	manufacturer TEXT NOT NULL, 
	mpn TEXT NOT NULL, 
	description TEXT, 
	package TEXT, 
	unit_price FLOAT, 
	stock INTEGER, 
	lifecycle TEXT, 
	inductance_h FLOAT, 
	tolerance FLOAT, 
	isat_a FLOAT, 
	irms_a FLOAT, 
	dcr_ohm FLOAT, 
	srf_hz FLOAT, 
	length_mm FLOAT, 
	width_mm FLOAT, 
	height_mm FLOAT, 
	shielded BOOLEAN, 
	extra TEXT, 
	source_line INTEGER, 
	batch_id INTEGER, 
	PRIMARY KEY (id), 
	FOREIGN KEY(batch_id) REFERENCES import_batches (id)
);
INSERT INTO parts_inductor VALUES(1,'inductor','Quillmark Magnetics','QM-1R0-0630','Shielded power choke 1.0 uH','0630',0.30999999999999999777,5200,'active',9.9999999999999995472e-07,0.2000000000000000111,9.5,8.0,0.0085000000000000006106,90000000.0,7.0,6.5999999999999996447,3.0,1,NULL,2,1);
INSERT INTO parts_inductor VALUES(2,'inductor','Quillmark Magnetics','QM-2R2-0630','Shielded power choke 2.2 uH','0630',0.30999999999999999777,4100,'active',2.2000000000000001121e-06,0.2000000000000000111,6.7999999999999998223,6.0,0.016000000000000000333,60000000.0,7.0,6.5999999999999996447,3.0,1,NULL,3,1);
INSERT INTO parts_inductor VALUES(3,'inductor','Quillmark Magnetics','QM-4R7-0630','Shielded power choke 4.7 uH','0630',0.32000000000000000666,3900,'active',4.6999999999999998931e-06,0.2000000000000000111,4.5999999999999996447,4.2000000000000001776,0.032000000000000000666,38000000.0,7.0,6.5999999999999996447,3.0,1,NULL,4,1);
INSERT INTO parts_inductor VALUES(4,'inductor','Quillmark Magnetics','QM-100-0630','Shielded power choke 10 uH','0630',0.33000000000000001554,2600,'nrnd',9.9999999999999991239e-06,0.2000000000000000111,3.1000000000000000888,2.7999999999999998223,0.068000000000000004884,25000000.0,7.0,6.5999999999999996447,3.0,1,NULL,5,1);
INSERT INTO parts_inductor VALUES(5,'inductor','Quillmark Magnetics','QM-220-1040','Shielded power choke 22 uH','1040',0.47999999999999998223,900,'active',2.1999999999999999427e-05,0.2000000000000000111,4.4000000000000003552,3.8999999999999999111,0.055000000000000000277,14000000.0,10.499999999999999999,10.0,4.0,1,NULL,6,1);
INSERT INTO parts_inductor VALUES(6,'inductor','Brindle Toroids','BT-470-0805U','Unshielded drum core 47 uH','0805',0.27000000000000001776,NULL,'obsolete',4.699999999999999724e-05,0.10000000000000000555,1.8999999999999999111,1.6000000000000000888,0.20999999999999999222,NULL,8.0,8.0,5.0,0,NULL,7,1);
CREATE TABLE parts_capacitor (
	id INTEGER NOT NULL, 
	kind VARCHAR(16) NOT NULL, 
	manufacturer TEXT NOT NULL, 
	mpn TEXT NOT NULL, 
	description TEXT, 
	package TEXT, 
	unit_price FLOAT, 
	stock INTEGER, 
	lifecycle TEXT, 
	capacitance_f FLOAT, 
	tolerance FLOAT, 
	voltage_v FLOAT, 
	dielectric TEXT, 
	esr_ohm FLOAT, 
	ripple_a FLOAT, 
	temp_max_degc FLOAT, 
	life_h FLOAT, 
	length_mm FLOAT, 
	width_mm FLOAT, 
	height_mm FLOAT, 
	extra TEXT, 
	source_line INTEGER, 
	batch_id INTEGER, 
	PRIMARY KEY (id), 
	FOREIGN KEY(batch_id) REFERENCES import_batches (id)
);
INSERT INTO parts_capacitor VALUES(1,'capacitor','Orrin Ceramics','OR-106-X7R-50',NULL,NULL,0.20999999999999999222,NULL,NULL,9.9999999999999991239e-06,NULL,50.0,'x7r',0.005000000000000000104,3.0,125.0,NULL,NULL,NULL,NULL,NULL,2,2);
INSERT INTO parts_capacitor VALUES(2,'capacitor','Orrin Ceramics','OR-104-C0G-100',NULL,NULL,0.080000000000000001665,NULL,NULL,1.000000000000000087e-07,NULL,100.0,'c0g',0.012000000000000000249,1.0,125.0,NULL,NULL,NULL,NULL,NULL,3,2);
INSERT INTO parts_capacitor VALUES(3,'capacitor','Vellum Electrolytics','VL-221-AE-35',NULL,NULL,0.17999999999999999333,NULL,NULL,0.00021999999999999998072,NULL,35.0,'al-electrolytic',0.14999999999999999444,0.9000000000000000222,105.0,2000.0,NULL,NULL,NULL,NULL,4,2);
INSERT INTO parts_capacitor VALUES(4,'capacitor','Vellum Electrolytics','VL-330-TA-16',NULL,NULL,0.94999999999999995559,NULL,NULL,0.00032999999999999999819,NULL,16.0,'ta-mno2',0.10000000000000000555,1.3999999999999999111,125.0,NULL,NULL,NULL,NULL,NULL,5,2);
CREATE TABLE parts_diode (
	id INTEGER NOT NULL, 
	kind VARCHAR(16) NOT NULL, 
	manufacturer TEXT NOT NULL, 
	mpn TEXT NOT NULL, 
	description TEXT, 
	package TEXT, 
	unit_price FLOAT, 
	stock INTEGER, 
	lifecycle TEXT, 
	diode_type TEXT, 
	vrrm_v FLOAT, 
	if_avg_a FLOAT, 
	ifsm_a FLOAT, 
	vf_v FLOAT, 
	trr_s FLOAT, 
	qrr_c FLOAT, 
	tj_max_degc FLOAT, 
	theta_ja_degc_w FLOAT, 
	extra TEXT, 
	source_line INTEGER, 
	batch_id INTEGER, 
	PRIMARY KEY (id), 
	FOREIGN KEY(batch_id) REFERENCES import_batches (id)
);
CREATE TABLE parts_mosfet (
	id INTEGER NOT NULL, 
	kind VARCHAR(16) NOT NULL, 
	manufacturer TEXT NOT NULL, 
	mpn TEXT NOT NULL, 
	description TEXT, 
	package TEXT, 
	unit_price FLOAT, 
	stock INTEGER, 
	lifecycle TEXT, 
	channel TEXT, 
	vds_v FLOAT, 
	id_a FLOAT, 
	rds_on_ohm FLOAT, 
	vgs_th_v FLOAT, 
	qg_c FLOAT, 
	qgd_c FLOAT, 
	coss_f FLOAT, 
	tj_max_degc FLOAT, 
	theta_ja_degc_w FLOAT, 
	extra TEXT, 
	source_line INTEGER, 
	batch_id INTEGER, 
	PRIMARY KEY (id), 
	FOREIGN KEY(batch_id) REFERENCES import_batches (id)
);
CREATE UNIQUE INDEX uq_diode_identity ON parts_diode (mpn, manufacturer);
CREATE UNIQUE INDEX uq_mosfet_identity ON parts_mosfet (mpn, manufacturer);
CREATE UNIQUE INDEX uq_inductor_identity ON parts_inductor (mpn, manufacturer);
CREATE UNIQUE INDEX uq_capacitor_identity ON parts_capacitor (mpn, manufacturer);
COMMIT;
