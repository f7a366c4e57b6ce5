/**
 * The closure catalogue: for every option of every closure choice in the case schema, a label, one line on
 * what it models and its published source. The case editor and the comparison view show these.
 */
import {
	bubbleClassModels,
	largeBubbleDrags,
	largeBubbleSizings,
	transitionCorrelations,
	bubbleInducedTurbulenceModels,
	bubbleSizings,
	convectionSchemes,
	dragLaws,
	liftModels,
	swarmCorrections,
	turbulentDispersionModels,
	virtualMassModels,
	wallFrictionModels,
	wallLubricationModels,
	liquidDispersionModels,
	massTransferCoefficientModels,
	transferSolutes
} from '../case.js';

export interface CatalogEntry {
	label: string;
	/** one line: what the option models */
	models: string;
	/** published source, or "common practice" */
	source: string;
}

type Catalog<T extends readonly string[]> = Record<T[number], CatalogEntry>;

export const dragCatalog: Catalog<typeof dragLaws> = {
	stokes: { label: 'Stokes', models: 'creeping-flow drag of a rigid sphere, C_D = 24/Re (Re ≲ 0.1)', source: 'G. G. Stokes (1851), Trans. Cambridge Philos. Soc. 9, 8' },
	'schiller-naumann': { label: 'Schiller–Naumann', models: 'rigid-sphere drag up to Re = 1000, then C_D = 0.44; suits small bubbles in ordinary water', source: 'L. Schiller, A. Naumann (1933), Z. Ver. Dtsch. Ing. 77, 318' },
	'ishii-zuber': { label: 'Ishii–Zuber', models: 'viscous, distorted and cap regimes with a holdup-dependent mixture viscosity', source: 'M. Ishii, N. Zuber (1979), AIChE J. 25, 843' },
	'tomiyama-pure': { label: 'Tomiyama (pure)', models: 'single bubbles in purified liquid, mobile interface', source: 'A. Tomiyama, I. Kataoka, I. Zun, T. Sakaguchi (1998), JSME Int. J. B 41, 472' },
	'tomiyama-slightly-contaminated': { label: 'Tomiyama (slightly contaminated)', models: 'single bubbles in slightly contaminated liquid', source: 'A. Tomiyama et al. (1998), JSME Int. J. B 41, 472' },
	'tomiyama-contaminated': { label: 'Tomiyama (contaminated)', models: 'single bubbles in contaminated (tap-water-like) liquid, immobile interface', source: 'A. Tomiyama et al. (1998), JSME Int. J. B 41, 472' }
};

export const swarmCatalog: Catalog<typeof swarmCorrections> = {
	none: { label: 'None', models: 'single-bubble drag used unchanged in the swarm', source: '—' },
	'richardson-zaki': { label: 'Richardson–Zaki', models: 'hindered rise U_t(1 − α)^(n−1) with n from the terminal Reynolds number', source: 'J. F. Richardson, W. N. Zaki (1954), Trans. Inst. Chem. Eng. 32, 35' },
	wallis: { label: 'Wallis (n = 2)', models: 'drift flux U_∞ α(1 − α)^n with n = 2 for small bubbles', source: 'G. B. Wallis (1969), One-Dimensional Two-Phase Flow, McGraw-Hill' }
};

export const virtualMassCatalog: Catalog<typeof virtualMassModels> = {
	none: { label: 'None', models: 'no added mass: the level zone of the height profile is less damped without it', source: '—' },
	constant: { label: 'Constant', models: 'added mass of the displaced liquid, C_VM = 0.5 for an isolated sphere', source: 'H. Lamb, Hydrodynamics, 6th ed. (1932)' },
	zuber: { label: 'Zuber', models: 'holdup-dependent C_VM = ½(1 + 2α)/(1 − α)', source: 'N. Zuber (1964), Chem. Eng. Sci. 19, 897' }
};

export const liftCatalog: Catalog<typeof liftModels> = {
	none: { label: 'None', models: 'no lateral lift (has no axial component in the height profile)', source: '—' },
	tomiyama: { label: 'Tomiyama', models: 'lift coefficient from Eo of the bubble width, changing sign near d ≈ 5.8 mm in water', source: 'A. Tomiyama, H. Tamai, I. Zun, S. Hosokawa (2002), Chem. Eng. Sci. 57, 1849' },
	constant: { label: 'Constant', models: 'a fixed lift coefficient', source: 'common practice' }
};

export const wallLubricationCatalog: Catalog<typeof wallLubricationModels> = {
	none: { label: 'None', models: 'no wall force on bubbles', source: '—' },
	antal: { label: 'Antal', models: 'wall force decaying with distance, active within a few bubble diameters', source: 'S. P. Antal, R. T. Lahey, J. E. Flaherty (1991), Int. J. Multiphase Flow 17, 635' },
	tomiyama: { label: 'Tomiyama', models: 'Eo-dependent wall force with 1/y² decay for a pipe', source: 'A. Tomiyama (1998), 3rd Int. Conf. Multiphase Flow, Lyon' },
	hosokawa: { label: 'Hosokawa', models: 'wall force with C_W = max(7/Re^1.9, 0.0217 Eo)', source: 'S. Hosokawa, A. Tomiyama, S. Misaki, T. Hamada (2002), ASME FEDSM2002-31148' },
	frank: { label: 'Frank', models: 'wall force that vanishes beyond a cut-off distance, Tomiyama C_W(Eo)', source: 'T. Frank et al. (2008), Nucl. Eng. Des. 238, 647' }
};

export const turbulentDispersionCatalog: Catalog<typeof turbulentDispersionModels> = {
	none: { label: 'None', models: 'no turbulent dispersion of bubbles', source: '—' },
	'lopez-de-bertodano': { label: 'Lopez de Bertodano', models: 'dispersion proportional to the liquid turbulent kinetic energy and the holdup gradient', source: 'M. Lopez de Bertodano (1991), PhD thesis, Rensselaer Polytechnic Institute' },
	burns: { label: 'Burns (Favre-averaged drag)', models: 'dispersion from the Favre-averaged drag, C_TD = 1, σ_TD = 0.9', source: 'A. D. Burns, T. Frank, I. Hamill, J.-M. Shi (2004), 5th Int. Conf. Multiphase Flow, Yokohama' }
};

export const bubbleInducedTurbulenceCatalog: Catalog<typeof bubbleInducedTurbulenceModels> = {
	none: { label: 'None', models: 'shear-induced liquid turbulence only', source: '—' },
	sato: { label: 'Sato', models: 'bubble-induced eddy viscosity 0.6 ρ_l α d |u_r| added to the shear-induced part', source: 'Y. Sato, K. Sekoguchi (1975), Int. J. Multiphase Flow 2, 79' }
};

export const wallFrictionCatalog: Catalog<typeof wallFrictionModels> = {
	none: { label: 'None', models: 'no wall shear on the liquid', source: '—' },
	blasius: { label: 'Blasius', models: 'liquid wall shear with f = 0.316 Re^−0.25 (64/Re below Re = 2000)', source: 'H. Blasius (1913), Forschungsheft VDI 131' }
};

export const convectionSchemeCatalog: Catalog<typeof convectionSchemes> = {
	'donor-cell': { label: 'Donor cell', models: 'first-order upwind holdup convection', source: 'D. R. Liles, W. H. Reed (1978), J. Comput. Phys. 26, 390' },
	'van-leer': { label: 'Van Leer limiter', models: 'second-order TVD holdup convection with the van Leer limiter', source: 'B. van Leer (1974), J. Comput. Phys. 14, 361' },
	minmod: { label: 'Minmod limiter', models: 'second-order TVD holdup convection with the minmod limiter (most diffusive TVD choice)', source: 'P. L. Roe (1986), Annu. Rev. Fluid Mech. 18, 337' }
};

export const bubbleSizingCatalog: Catalog<typeof bubbleSizings> = {
	fixed: { label: 'Fixed', models: 'the bubble diameter entered in the case', source: '—' },
	'akita-yoshida': { label: 'Akita–Yoshida', models: 'Sauter diameter from Bo, Ga and Fr of the column', source: 'K. Akita, F. Yoshida (1974), Ind. Eng. Chem. Process Des. Dev. 13, 84' }
};

export const bubbleClassCatalog: Catalog<typeof bubbleClassModels> = {
	single: { label: 'One bubble size', models: 'all gas as one dispersed field of one diameter (bubbly, homogeneous flow)', source: '—' },
	'small-large': {
		label: 'Small + large bubbles',
		models: 'above the regime transition the small bubbles carry the transition gas rate and the excess rises as large bubbles, each class with its own continuity, momentum and drag',
		source: 'R. Krishna, J. Ellenberger (1996), AIChE J. 42, 2627'
	},
	'size-classes': {
		label: 'Size classes (coalescence and breakup)',
		models:
			'a bubble size distribution on a geometric grid of size classes, each with its own continuity, momentum and drag; coalescence (turbulent and buoyancy-driven collisions, film drainage) and breakup by turbulent eddies move gas between the classes, with ε = g U_G',
		source:
			'S. Kumar, D. Ramkrishna (1996), Chem. Eng. Sci. 51, 1311 (fixed pivot); M. J. Prince, H. W. Blanch (1990), AIChE J. 36, 1485 (coalescence); H. Luo, H. F. Svendsen (1996), AIChE J. 42, 1225 (breakup)'
	}
};

export const transitionCatalog: Catalog<typeof transitionCorrelations> = {
	reilly: { label: 'Reilly et al.', models: 'transition holdup from gas density and surface tension; transition velocity ε_trans(1 − ε_trans) U_sb', source: 'I. G. Reilly, D. S. Scott, T. J. W. de Bruijn, D. MacIntyre (1994), Can. J. Chem. Eng. 72, 3' },
	fixed: { label: 'Entered', models: 'the transition velocity and holdup entered in the case (e.g. measured on the pilot column)', source: '—' }
};

export const largeBubbleSizingCatalog: Catalog<typeof largeBubbleSizings> = {
	krishna: { label: 'Krishna–Ellenberger', models: 'large-bubble diameter 0.069 (U_G − U_trans)^0.376 m', source: 'R. Krishna, J. Ellenberger (1996), AIChE J. 42, 2627' },
	fixed: { label: 'Fixed', models: 'the large-bubble diameter entered in the case', source: '—' }
};

export const largeBubbleDragCatalog: Catalog<typeof largeBubbleDrags> = {
	'krishna-swarm': {
		label: 'Cap swarm (Krishna)',
		models: 'swarm velocity 0.71 √(g d) · wall factor (Collins 1967) · acceleration factor 2.73 + 4.505 (U_G − U_trans)',
		source: 'R. Krishna, M. I. Urseanu, J. M. van Baten, J. Ellenberger (1999), Chem. Eng. Sci. 54, 171'
	},
	'spherical-cap': { label: 'Single spherical cap', models: 'C_D = 8/3, the rise velocity of one cap bubble (no swarm acceleration)', source: 'R. M. Davies, G. I. Taylor (1950), Proc. R. Soc. Lond. A 200, 375' }
};

export const transferDispersionCatalog: Catalog<typeof liquidDispersionModels> = {
	deckwer: { label: 'Deckwer et al.', models: 'liquid axial dispersion D_L = 0.678 D^1.4 U_G^0.3 (SI; 2.7 D^1.4 U_G^0.3 in cgs)', source: 'W.-D. Deckwer, R. Burckhart, G. Zoll (1974), Chem. Eng. Sci. 29, 2177' },
	'baird-rice': { label: 'Baird & Rice', models: 'liquid axial dispersion from isotropic turbulence, D_L = 0.35 D^(4/3) (g U_G)^(1/3)', source: 'M. H. I. Baird, R. G. Rice (1975), Chem. Eng. J. 9, 171' },
	fixed: { label: 'Entered', models: 'the liquid axial dispersion coefficient entered in the case (e.g. from a tracer test)', source: '—' }
};

export const massTransferCoefficientCatalog: Catalog<typeof massTransferCoefficientModels> = {
	higbie: { label: 'Higbie penetration', models: 'mobile interface: k_L = 2 √(D u_r/(π d)), contact time d/u_r', source: 'R. Higbie (1935), Trans. AIChE 31, 365' },
	frossling: {
		label: 'Frössling (rigid interface)',
		models: 'rigid or contaminated interface, as small bubbles in tap water: Sh = 2 + 0.552 Re^½ Sc^⅓',
		source: 'N. Frössling (1938), Gerlands Beitr. Geophys. 52'
	}
};

export const transferSoluteCatalog: Catalog<typeof transferSolutes> = {
	oxygen: { label: 'Oxygen', models: 'solubility from the Benson–Krause saturation with water-saturated air, Henry’s law at the local pressure', source: 'B. B. Benson, D. Krause (1984), Limnol. Oceanogr. 29, 620' },
	'carbon-dioxide': { label: 'Carbon dioxide', models: 'Henry’s law, 3.3e-4 mol/(m³ Pa) at 25 °C with d ln H/d(1/T) = 2400 K, physical solubility only (no carbonate equilibria)', source: 'R. Sander (2023), Atmos. Chem. Phys. 23, 10901' }
};

/** The whole catalogue keyed by the case field it describes (`closures.drag`, …). */
export const closureCatalog = {
	'closures.drag': dragCatalog,
	'closures.swarm': swarmCatalog,
	'closures.virtualMass': virtualMassCatalog,
	'closures.lift': liftCatalog,
	'closures.wallLubrication': wallLubricationCatalog,
	'closures.turbulentDispersion': turbulentDispersionCatalog,
	'closures.bubbleInducedTurbulence': bubbleInducedTurbulenceCatalog,
	'closures.wallFriction': wallFrictionCatalog,
	'numerics.scheme': convectionSchemeCatalog,
	'bubbles.sizing': bubbleSizingCatalog,
	'bubbles.classes': bubbleClassCatalog,
	'bubbles.transition': transitionCatalog,
	'bubbles.largeSizing': largeBubbleSizingCatalog,
	'bubbles.largeDrag': largeBubbleDragCatalog,
	'transfer.solute': transferSoluteCatalog,
	'transfer.dispersion': transferDispersionCatalog,
	'transfer.massTransferCoefficient': massTransferCoefficientCatalog
} as const;
