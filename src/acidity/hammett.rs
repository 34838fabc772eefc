//! Hammett corrections for sites on or next to a six-membered aromatic ring: every ring
//! substituent counts with sigma_o, sigma_m or sigma_p by its ring distance from the ring atom
//! nearest the site (the ipso atom), times the series' rho. Aza ring members count too
//! (pyrimidine against pyridine), and the far atoms of a fused ring count as aryl groups.

use std::collections::VecDeque;

use super::estimate::{Correction, Term};
use super::lookup::Lookup;
use super::substituent::{Position, Series};
use crate::chem::molecule::{Molecule, Order};

/// How far from the site (in bonds) the ring may start: phenylacetic acid O-C-C-c is three.
const MAX_REACH: usize = 3;

/// The Hammett terms of the site at `site`, or `None` when no six-membered aromatic ring lies
/// within reach.
pub fn correct(mol: &Molecule, site: usize, series: &Series, look: &Lookup) -> Option<Correction> {
    let (ipso, came_from, _) = nearest_ring_atom(mol, site)?;
    ring_terms(mol, ipso, came_from, site, series, look)
}

/// The six-membered aromatic ring atom nearest `site` (the one its Hammett terms are counted
/// from) and the bonds between them, if such an atom lies within reach.
pub fn ipso(mol: &Molecule, site: usize) -> Option<(usize, usize)> {
    nearest_ring_atom(mol, site).map(|(ipso, _, bonds)| (ipso, bonds))
}

/// The Hammett terms of the substituents on the six-membered aromatic ring at `ipso`, seen
/// from `came_from` (an aryl group in a Taft chain: its ring substituents, sigma by position
/// from the atom that bears the chain). `None` when `ipso` is not in such a ring.
pub fn aryl_terms(
    mol: &Molecule,
    ipso: usize,
    came_from: usize,
    series: &Series,
    look: &Lookup,
) -> Option<Correction> {
    ring_terms(mol, ipso, Some(came_from), came_from, series, look)
}

fn ring_terms(
    mol: &Molecule,
    ipso: usize,
    came_from: Option<usize>,
    site: usize,
    series: &Series,
    look: &Lookup,
) -> Option<Correction> {
    let ring =
        mol.rings.rings.iter().find(|r| {
            r.len() == 6 && r.contains(&ipso) && r.iter().all(|&a| mol.atoms[a].aromatic)
        })?;
    // The site is the ring N itself (pyridinium, lactam N-H): its ortho groups act directly.
    let aza_site = ipso == site && mol.atoms[site].element == 7;
    // A pyridine-type ring N site (two ring neighbours, no H): its lone pair lies in the ring
    // plane, out of reach of a para group's pi resonance.
    let in_plane = aza_site && mol.atoms[site].hydrogens() == 0 && mol.degree(site) == 2;
    let mut c = Correction {
        ipso: Some(ipso),
        ..Correction::default()
    };
    // An exocyclic imine on the ring (a 1-alkyl-2(1H)-pyridinimine): its cation is an
    // amidinium ion whose charge the N-alkyl ring N shares, and a strong donor ortho or para to
    // that ring N conjugates with it where the series, counting from the imine carbon, does
    // not look. Each such donor counts as a group without constants.
    let imine = ipso != site
        && mol.atoms[site].element == 7
        && mol.adjacency[site]
            .iter()
            .any(|&(x, b)| x == ipso && mol.bonds[b].order == Order::Double);
    let charged_ring_n: Vec<usize> = if imine {
        mol.adjacency[ipso]
            .iter()
            .map(|&(x, _)| x)
            .filter(|&x| ring.contains(&x) && mol.atoms[x].element == 7 && mol.degree(x) == 3)
            .collect()
    } else {
        Vec::new()
    };
    for &r in ring {
        let distance = ring_distance(ring, ipso, r);
        if r != ipso {
            match look.at(r, None, Position::Ring) {
                Some(row) => add(
                    &mut c,
                    series,
                    row.sigma_at(distance, series.para, in_plane),
                    distance,
                    &row.name,
                    false,
                    None,
                ),
                // A ring member other than carbon with no ring row (the N of a lactam, the O of
                // a pyrone) has no constant: it widens the range.
                None if mol.atoms[r].element != 6 => c.unknown += 1,
                None => {}
            }
        }
        for &(x, _) in &mol.adjacency[r] {
            if ring.contains(&x) || Some(x) == came_from || x == site {
                continue;
            }
            if r == ipso {
                // A second group on the ipso atom itself (rare): no Hammett position.
                c.unknown += 1;
                continue;
            }
            match look.at_with(x, Some(r), Position::Attached) {
                Some((row, matched)) => {
                    c.unknown += super::taft::beyond_the_row(mol, x, r, matched);
                    add(
                        &mut c,
                        series,
                        para_acceptor_at_ring_n(
                            row,
                            distance,
                            in_plane,
                            row.sigma_at(distance, series.para, in_plane),
                        ),
                        distance,
                        &row.name,
                        true,
                        row.sigma_m,
                    );
                    c.unknown += pendant_aryl_unknowns(mol, x, ring);
                    c.unknown += extension_unknowns(mol, x, r, ring);
                    c.unknown += functional_alkyl_unknown(mol, x, r, row);
                    let conjugated = |&n: &usize| matches!(ring_distance(ring, n, r), 1 | 3);
                    if row.sigma_p.is_some_and(|p| p < STRONG_DONOR)
                        && charged_ring_n.iter().any(conjugated)
                    {
                        c.unknown += 1;
                    }
                }
                None => c.unknown += 1,
            }
        }
    }
    saturate_donors(&mut c, series);
    cross_ring(mol, ring, ipso, series, look, &mut c, true);
    Some(c)
}

/// A para group that withdraws by resonance (sigma_p above sigma_m) acts on a pyridine-type
/// ring N only inductively, with sigma_m: isonicotinamide 3.61 and ethyl isonicotinate 3.45
/// against pyridine 5.23 (rho 5.9) give 0.27 and 0.30, at or below the amide's and ester's
/// sigma_m (0.28, 0.37) and well below their sigma_p (0.36, 0.45) (Perrin 1965, from memory;
/// neither compound is in the calibration set). Donors keep sigma_p: their resonance reaches
/// the ring N (4-aminopyridine, 4-methoxypyridine).
fn para_acceptor_at_ring_n(
    row: &super::substituent::Substituent,
    distance: usize,
    in_plane: bool,
    (sigma, stand_in): (f64, bool),
) -> (f64, bool) {
    match (row.sigma_m, row.sigma_p) {
        (Some(m), Some(p)) if in_plane && distance == 3 && p > m => (m, stand_in),
        _ => (sigma, stand_in),
    }
}

/// Share of a substituent's sigma_m that crosses into the ring that holds the site from a
/// fused benzene-type ring: 5-nitroquinoline 2.72 and 5-nitroisoquinoline 3.55 against
/// quinoline 4.90 and isoquinoline 5.40 (rho 5.9) give 0.52 and 0.44 (Perrin 1965, from
/// memory); their mean. Donors at positions not conjugated with the site cross as weakly
/// (5-aminoisoquinoline 5.59, 6-aminoquinoline 5.63); see `CROSS_RING_CONJUGATED`.
const CROSS_RING: f64 = 0.48;

/// Share of a net donor's sigma_p (below zero and below its sigma_m: amino, alkoxy, alkyl)
/// that reaches the site from a fused ring position conjugated with it (an odd number of
/// bonds from the ring atom nearest the site, as ortho and para are in one ring) and not next
/// to the fusion: 7-aminoquinoline 6.65 against quinoline 4.94 and 6-aminoisoquinoline 7.17
/// against isoquinoline 5.40 (rho 5.9, sigma_p of amino -0.66) give 0.44 and 0.45 (Albert,
/// Goldacre & Phillips, J. Chem. Soc. 1948, 2240, from memory; neither compound is in the
/// calibration set). Positions next to the fusion
/// (5-aminoquinoline 5.46, 8-aminoisoquinoline 6.06) and the unconjugated ones
/// (6-aminoquinoline 5.63, 7-aminoisoquinoline 6.20) stay with `CROSS_RING` of sigma_m.
const CROSS_RING_CONJUGATED: f64 = 0.45;

/// Substituents on a fused six-membered aromatic ring (its own atoms next to the fusion count
/// already as attached groups). Each counts with its sigma_m times `CROSS_RING`, a donor at
/// a conjugated position with its sigma_p times `CROSS_RING_CONJUGATED`. With
/// `far_aza`, an aza member of the fused ring that is not next to the fusion (N6 or N7 seen
/// from a quinoline N1) counts the same way, as a ring N for C-H substituent on that ring:
/// 2,6-naphthyridine 3.9 and 2,7-naphthyridine 3.4 against isoquinoline 5.40 (rho 5.9) give
/// 0.39 and 0.52 of the aza sigma_m 0.65, the share `CROSS_RING` describes (Albert 1960,
/// from memory). Quinazolines and pteridines that hydrate covalently have their own group
/// rows, whose parents carry these terms too, so they cancel there. A further ring fused onto
/// the fused ring has no constant: it widens the range as an unknown group.
fn cross_ring(
    mol: &Molecule,
    ring: &[usize],
    ipso: usize,
    series: &Series,
    look: &Lookup,
    c: &mut Correction,
    far_aza: bool,
) {
    let six = |r: &&Vec<usize>| r.len() == 6 && r.iter().all(|&a| mol.atoms[a].aromatic);
    let mut further_rings: Vec<usize> = Vec::new();
    for fused in mol.rings.rings.iter().filter(six) {
        let shared: Vec<usize> = fused.iter().copied().filter(|a| ring.contains(a)).collect();
        if shared.len() != 2 || shared.contains(&ipso) {
            continue;
        }
        for &f in fused.iter().filter(|a| !ring.contains(a)) {
            let next_to_fusion = mol.adjacency[f].iter().any(|&(y, _)| ring.contains(&y));
            // Conjugated with the site: an odd number of bonds from the ipso atom (both
            // rings have six members, so every path has the same parity).
            let bonds = shared
                .iter()
                .map(|&s| ring_distance(fused, f, s) + ring_distance(ring, s, ipso))
                .min()
                .unwrap_or(0);
            let conjugated = ring.len() == 6 && !next_to_fusion && bonds % 2 == 1;
            // Peri: next to the fusion atom that is itself next to the site's ring atom (C8 of
            // a quinoline seen from N1), as close to the site as an ortho group, with proximity
            // effects (steric, hydrogen bonds) that no sigma holds: widened as an ortho group.
            let peri = mol.adjacency[f]
                .iter()
                .any(|&(s, _)| shared.contains(&s) && ring_distance(ring, s, ipso) == 1);
            let mut push = |row: &super::substituent::Substituent, attached: bool| {
                let sigma = match (row.sigma_m, row.sigma_p) {
                    (Some(m), Some(p)) if conjugated && p < m.min(0.0) => CROSS_RING_CONJUGATED * p,
                    (m, _) => CROSS_RING * m.unwrap_or(0.0),
                };
                let mut term = Term::plain(format!("fused-{}", row.name), sigma, series.rho);
                term.ortho = peri && attached;
                c.terms.push(term);
            };
            if far_aza
                && !next_to_fusion
                && let Some(row) = look.at(f, None, Position::Ring)
            {
                push(row, false);
            }
            for &(y, _) in &mol.adjacency[f] {
                // Atoms of further rings on this one (benzo[h]quinoline-type) are not
                // substituents; such a ring is counted once as a group without constants.
                let further = mol
                    .rings
                    .rings
                    .iter()
                    .position(|r| r.contains(&y) && r.contains(&f));
                if let Some(r) = further
                    && !fused.contains(&y)
                    && !ring.contains(&y)
                    && !further_rings.contains(&r)
                {
                    further_rings.push(r);
                    c.unknown += 1;
                }
                if fused.contains(&y) || ring.contains(&y) || further.is_some() {
                    continue;
                }
                match look.at(y, Some(f), Position::Attached) {
                    Some(row) => push(row, true),
                    None => c.unknown += 1,
                }
            }
        }
    }
}

/// The Hammett terms of a site that is itself a member of a five-membered aromatic ring
/// (an azole ring N): the other ring members (aza atoms by their ring rows) and everything
/// attached to them count with sigma_m, the position a five-membered ring offers (as PDS 1981
/// treat imidazoles, pyrazoles and thiazoles). `None` when the site is not in such a ring.
pub fn correct_five(
    mol: &Molecule,
    site: usize,
    series: &Series,
    look: &Lookup,
) -> Option<Correction> {
    let ring =
        mol.rings.rings.iter().find(|r| {
            r.len() == 5 && r.contains(&site) && r.iter().all(|&a| mol.atoms[a].aromatic)
        })?;
    let mut c = Correction::default();
    // A 1-substituted imidazole-type ring: the other ring N, two bonds from the site, bears a
    // group instead of an H, so the tautomers no longer average its neighbours' positions.
    let fixed = ring.iter().any(|&r| {
        r != site
            && mol.atoms[r].element == 7
            && ring_distance(ring, site, r) == 2
            && mol.atoms[r].hydrogens() == 0
            && mol.degree(r) == 3
    });
    let push =
        |c: &mut Correction, row: &super::substituent::Substituent, at: usize, share: f64| {
            let sigma = share * row.sigma_m.unwrap_or(0.0);
            let label = if at == 1 { "2" } else { "3" };
            c.terms.push(Term::plain(
                format!("{label}-{}", row.name),
                sigma,
                series.rho,
            ));
        };
    for &r in ring.iter().filter(|&&r| r != site) {
        let at = ring_distance(ring, site, r);
        if let Some(row) = look.at(r, None, Position::Ring) {
            push(&mut c, row, at, 1.0);
        }
        for &(x, _) in &mol.adjacency[r] {
            if ring.contains(&x) {
                continue;
            }
            // Groups on the carbon next to the substituted N (C5) act from farther away; a
            // fused ring there (benzimidazoles, purines) keeps the share its row's parent has.
            let fused = || {
                mol.rings
                    .rings
                    .iter()
                    .any(|f| f.contains(&x) && f.contains(&r))
            };
            let share = if fixed && at == 2 && mol.atoms[r].element == 6 && !fused() {
                FIXED_FAR
            } else {
                1.0
            };
            match look.at(x, Some(r), Position::Attached) {
                // An alkyl group on the pyrrole-type N stands in for its N-H: 1-methylimidazole
                // 7.06 against imidazole 6.99, 1-methylbenzimidazole 5.57 against 5.53 (Perrin
                // 1965, from memory). Next to the site (pyrazoles) it costs a little:
                // `N_ALKYL_BESIDE_SITE`.
                // (Any alkyl group: a saturated carbon whose sigma_m does not withdraw.)
                Some(row)
                    if mol.atoms[r].element == 7
                        && mol.is_saturated_carbon(x)
                        && row.sigma_m.is_some_and(|m| m <= 0.0) =>
                {
                    if at == 1 {
                        c.terms.push(Term::plain(
                            "1-alkyl beside the site".to_string(),
                            -N_ALKYL_BESIDE_SITE / series.rho,
                            series.rho,
                        ));
                    }
                }
                Some(row) => {
                    push(&mut c, row, at, share);
                    c.unknown += pendant_aryl_unknowns(mol, x, ring);
                    c.unknown += functional_alkyl_unknown(mol, x, r, row);
                }
                None => c.unknown += 1,
            }
        }
    }
    // Substituents on a fused benzene-type ring (benzimidazoles); its aza members stay out,
    // as the fused aza row already counts those next to the fusion.
    cross_ring(mol, ring, site, series, look, &mut c, false);
    Some(c)
}

/// Share of rho times sigma_m with which a group on C5 of a 1-substituted imidazole acts on
/// N3 (C5 is two bonds from the site and next to the substituted N; the series' rho rests on
/// N-H imidazoles, whose tautomers average C4 and C5): metronidazole 2.55 against 7.66 for
/// its 1,2-dimethylimidazole core by the series gives 5.1 for a 5-nitro group where rho 9.5
/// times sigma_m 0.71 gives 6.7, a share of 0.76 (Perrin 1965 and the drug's monographs,
/// from memory; metronidazole is not in the calibration set).
const FIXED_FAR: f64 = 0.75;

/// What the aryl constants (those of phenyl) leave out of an aromatic ring bonded to the site's
/// ring at `x` and not fused with it (sharing no atom with `site_ring`): each ring member other
/// than carbon (a pyridyl or thiazolyl group is not a phenyl group) and each group on its
/// members (a nitrophenyl group). Each counts as a group without constants, which widens the
/// range; none is corrected.
pub(crate) fn pendant_aryl_unknowns(mol: &Molecule, x: usize, site_ring: &[usize]) -> usize {
    if !mol.atoms[x].aromatic {
        return 0;
    }
    let fused = |r: &Vec<usize>| r.iter().any(|a| site_ring.contains(a));
    let Some(ring) = mol
        .rings
        .rings
        .iter()
        .filter(|r| r.contains(&x) && r.iter().all(|&a| mol.atoms[a].aromatic))
        .min_by_key(|r| r.len())
    else {
        return 0;
    };
    if fused(ring) {
        return 0;
    }
    ring.iter()
        .filter(|&&a| a != x)
        .map(|&a| {
            let hetero = usize::from(mol.atoms[a].element != 6);
            let groups = mol.adjacency[a]
                .iter()
                .filter(|&&(y, _)| !ring.contains(&y))
                .count();
            hetero + groups
        })
        .sum()
}

/// pKa change when an alkyl group replaces the H of the pyrrole-type N next to an azole site
/// (its ortho position, so not averaged away by tautomerism): 1-methylpyrazole 2.06 against
/// pyrazole 2.48 (Perrin 1965, from memory; neither is in the calibration set).
const N_ALKYL_BESIDE_SITE: f64 = -0.42;

/// A saturated carbon read by the plain alkyl row (one pattern atom, methyl's constants) that
/// carries a heteroatom or an unsaturated group besides the ring (CH2NR2, CH2CO2H, CH2SR):
/// the methyl constants leave that group out, so it counts as one group without constants.
fn functional_alkyl_unknown(
    mol: &Molecule,
    x: usize,
    r: usize,
    row: &super::substituent::Substituent,
) -> usize {
    let generic = row.pattern.atom_count() == 1;
    let functional = mol.adjacency[x]
        .iter()
        .any(|&(y, _)| y != r && !mol.is_saturated_carbon(y));
    usize::from(generic && mol.is_saturated_carbon(x) && functional)
}

/// What the vinyl, ethynyl and azo constants (CH=CH2, C#CH, N=NPh) leave out of a conjugated
/// group bonded to the site's ring at `x` (from ring atom `r`): each group on its far atom
/// (the phenyl of a styryl group) besides the phenyl the azo row holds, and what hangs on an
/// aryl group there. Each counts as a group without constants.
fn extension_unknowns(mol: &Molecule, x: usize, r: usize, site_ring: &[usize]) -> usize {
    if mol.atoms[x].aromatic {
        return 0;
    }
    let far = mol.adjacency[x].iter().find(|&&(y, b)| {
        y != r
            && !mol.atoms[y].aromatic
            && matches!(mol.bonds[b].order, Order::Double | Order::Triple)
    });
    let Some(&(y, _)) = far else {
        return 0;
    };
    let azo = mol.atoms[x].element == 7 && mol.atoms[y].element == 7;
    let vinyl = mol.atoms[x].element == 6 && mol.atoms[y].element == 6;
    if !(azo || vinyl) {
        return 0;
    }
    mol.adjacency[y]
        .iter()
        .filter(|&&(z, _)| z != x)
        .map(|&(z, _)| {
            let aryl = mol.atoms[z].aromatic;
            // The azo row's own group is a phenyl; anything else on its far N is not.
            let own = usize::from(!(azo && aryl));
            own + if aryl {
                pendant_aryl_unknowns(mol, z, site_ring)
            } else {
                0
            }
        })
        .sum()
}

/// Strong ortho/para donors below this sigma compete for one conjugation path.
const STRONG_DONOR: f64 = -0.2;

/// Resonance saturation: of several strong ortho/para donors (amino groups on one pyrimidine)
/// only the strongest conjugates fully with the site; the others count with sigma_m, their
/// inductive part (Perrin, Dempsey & Serjeant 1981 warn that sigma_p values are not additive
/// for several donors; this split is our rule).
fn saturate_donors(c: &mut Correction, series: &Series) {
    let mut donors: Vec<usize> = (0..c.terms.len())
        .filter(|&i| c.terms[i].sigma < STRONG_DONOR && c.terms[i].inductive.is_some())
        .collect();
    donors.sort_by(|&a, &b| c.terms[a].sigma.total_cmp(&c.terms[b].sigma));
    for &i in donors.iter().skip(1) {
        let t = &mut c.terms[i];
        if let Some(m) = t.inductive {
            t.shift += series.rho * (t.sigma - m);
            t.sigma = m;
            t.stand_in = false;
            // The split is not checked against a handbook series: how much of the donor's
            // resonance remains is unknown, so it widens the range as a group without
            // constants does.
            c.unknown += 1;
        }
    }
}

fn add(
    c: &mut Correction,
    series: &Series,
    (sigma, stand_in): (f64, bool),
    distance: usize,
    name: &str,
    attached: bool,
    sigma_m: Option<f64>,
) {
    let label = ["ipso", "o", "m", "p"][distance.min(3)];
    let mut shift = -series.rho * sigma;
    let ortho = distance == 1;
    if ortho && attached {
        shift += series.ortho_shift;
    }
    c.terms.push(Term {
        label: format!("{label}-{name}"),
        sigma,
        shift,
        ortho,
        stand_in,
        inductive: (distance != 2 && attached).then_some(sigma_m).flatten(),
    });
}

/// Breadth-first from the site to the first aromatic atom of a six-membered ring; also the
/// atom the path arrived from (not a substituent of the ring) and the bonds walked.
fn nearest_ring_atom(mol: &Molecule, site: usize) -> Option<(usize, Option<usize>, usize)> {
    let in_six_ring = |a: usize| {
        mol.atoms[a].aromatic
            && mol
                .rings
                .rings
                .iter()
                .any(|r| r.len() == 6 && r.contains(&a))
    };
    let mut prev = vec![None; mol.atoms.len()];
    let mut depth = vec![usize::MAX; mol.atoms.len()];
    let mut queue = VecDeque::from([site]);
    depth[site] = 0;
    while let Some(a) = queue.pop_front() {
        if in_six_ring(a) {
            return Some((a, prev[a], depth[a]));
        }
        if depth[a] == MAX_REACH {
            continue;
        }
        for &(x, _) in &mol.adjacency[a] {
            if depth[x] == usize::MAX {
                depth[x] = depth[a] + 1;
                prev[x] = Some(a);
                queue.push_back(x);
            }
        }
    }
    None
}

/// Bonds between two members of a ring (its atoms in cycle order).
fn ring_distance(ring: &[usize], a: usize, b: usize) -> usize {
    let i = ring.iter().position(|&x| x == a).unwrap_or(0);
    let j = ring.iter().position(|&x| x == b).unwrap_or(0);
    let d = i.abs_diff(j);
    d.min(ring.len() - d)
}
