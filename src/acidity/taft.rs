//! Taft sigma* corrections for aliphatic sites (carboxylic acids, ammonium ions, thiols): the
//! groups on the site's centre atom are summed as sigma*, where a tabulated group is taken as
//! is and a plain saturated carbon is followed outwards, each further atom's sigma* damped by
//! the series' attenuation per intervening carbon (Perrin, Dempsey & Serjeant 1981).

use super::estimate::{Correction, Term};
use super::hammett;
use super::lookup::Lookup;
use super::substituent::{Position, Series};
use crate::chem::molecule::{Molecule, Order};

/// sigma*(ethyl) - sigma*(methyl): each further alkyl carbon on a chain carbon donates a little
/// (Taft 1956: ethyl -0.10, isopropyl -0.19, tert-butyl -0.30; from memory).
const ALKYL_STEP: f64 = -0.10;
/// Bonds followed outwards from the centre; beyond this the damped effect is negligible.
const MAX_DEPTH: usize = 4;

/// The Taft terms of the site at `site`. With `aryl` (the series that turns an aryl group's
/// ring substituents into a change of its sigma*), substituted aryl groups count with their
/// ring substituents. With `cation` (an ammonium-type site) groups take their
/// `sigma_star_ammonium` where they have one.
pub fn correct(
    mol: &Molecule,
    site: usize,
    series: &Series,
    cation: bool,
    aryl: Option<&Series>,
    look: &Lookup,
) -> Correction {
    let centre = centre_atom(mol, site);
    let mut visited = vec![false; mol.atoms.len()];
    visited[site] = true;
    visited[centre] = true;
    let how = How {
        series,
        cation,
        aryl,
        look,
    };
    let mut c = Correction::default();
    for (_, term, unknown) in groups_on(mol, centre, &mut visited, &how, "") {
        c.terms.push(term);
        c.unknown += unknown;
    }
    if let Some(floor) = series.sigma_floor {
        // The plateau caps what the donating (alkyl) groups give, whatever withdrawing groups
        // sit beside them on the same N.
        let sum: f64 = c.terms.iter().map(|t| t.sigma.min(0.0)).sum();
        if sum < floor {
            c.terms.push(Term::plain(
                "alkyl plateau".to_string(),
                floor - sum,
                series.rho,
            ));
        }
    }
    c
}

/// The Taft terms of the groups on a site bonded to an aromatic ring at `ring_atom`, besides
/// that ring (the N-alkyl groups of an N-alkylaniline): the aromatic ring's own atoms are not
/// walked into, so a chain that closes back onto it (tetrahydroquinoline) ends there.
pub fn side(
    mol: &Molecule,
    site: usize,
    ring_atom: usize,
    series: &Series,
    aryl: Option<&Series>,
    look: &Lookup,
) -> Correction {
    let mut visited = vec![false; mol.atoms.len()];
    visited[site] = true;
    let aromatic = |r: &&Vec<usize>| r.iter().all(|&a| mol.atoms[a].aromatic);
    for ring in mol
        .rings
        .rings
        .iter()
        .filter(|r| r.contains(&ring_atom))
        .filter(aromatic)
    {
        for &a in ring {
            visited[a] = true;
        }
    }
    // An N-alkylanilinium ion is an ammonium ion too.
    let how = How {
        series,
        cation: true,
        aryl,
        look,
    };
    let mut c = Correction::default();
    for (r, mut term, unknown) in groups_on(mol, site, &mut visited, &how, "N-") {
        // A tertiary alkyl group on the N turns it out of the ring's plane (steric inhibition
        // of resonance; common practice), an effect no sigma* holds: widened as an ortho
        // group is.
        term.ortho = mol.is_saturated_carbon(r) && mol.atoms[r].hydrogens() == 0;
        c.terms.push(term);
        c.unknown += unknown;
    }
    c
}

/// What a walk counts with: the series, whether the site is a cation, the aryl series and the
/// substituent lookup.
struct How<'a> {
    series: &'a Series,
    cation: bool,
    aryl: Option<&'a Series>,
    look: &'a Lookup<'a, 'a>,
}

/// One term per group singly bonded to `centre` and not yet visited: the group's first atom,
/// its term and how many groups without constants its walk met.
fn groups_on(
    mol: &Molecule,
    centre: usize,
    visited: &mut Vec<bool>,
    how: &How,
    prefix: &str,
) -> Vec<(usize, Term, usize)> {
    let How {
        series,
        cation,
        aryl,
        look,
    } = *how;
    let mut out = Vec::new();
    for &(r, bond) in &mol.adjacency[centre] {
        if visited[r] || mol.bonds[bond].order != Order::Single {
            continue;
        }
        let mut walk = Walk {
            mol,
            look,
            attenuation: series.attenuation,
            aryl,
            visited,
            unknown: 0,
            ammonium: cation,
        };
        let sigma = walk.group(r, centre, 1);
        let unknown = walk.unknown;
        let name = look
            .at(r, Some(centre), Position::Attached)
            .map_or("alkyl", |row| row.name.as_str());
        let term = Term::plain(format!("{prefix}{name}"), sigma, series.rho);
        out.push((r, term, unknown));
    }
    out
}

/// The carbonyl carbon of an acid O-H or S-H (the groups sit on it); the carbinol carbon of
/// an alcohol O-H (Ballinger & Long sum sigma* over the carbinol's groups); else the site.
fn centre_atom(mol: &Molecule, site: usize) -> usize {
    if matches!(mol.atoms[site].element, 8 | 16)
        && let [(c, _)] = mol.adjacency[site][..]
    {
        let carbonyl = mol.adjacency[c].iter().any(|&(x, b)| {
            x != site && mol.bonds[b].order == Order::Double && mol.atoms[x].element != 6
        });
        let carbinol = mol.atoms[site].element == 8 && mol.is_saturated_carbon(c);
        if carbonyl || carbinol {
            return c;
        }
    }
    site
}

/// What a tabulated group's constant leaves out on its first atom: a heteroatom or an
/// unsaturated, non-aromatic carbon there beyond the row's pattern (the phosphoryl of an
/// S-phosphoryl group read as SMe, the second acyl of an imide N read as NHAc). Each counts as
/// a group without constants.
pub(crate) fn beyond_the_row(mol: &Molecule, atom: usize, from: usize, matched: &[usize]) -> usize {
    mol.adjacency[atom]
        .iter()
        .filter(|&&(y, _)| y != from && !matched.contains(&y))
        .filter(|&&(y, _)| {
            let a = &mol.atoms[y];
            a.element != 6 && a.element != 1 || (!a.aromatic && !mol.is_saturated_carbon(y))
        })
        .count()
}

struct Walk<'m, 'v> {
    mol: &'m Molecule,
    look: &'m Lookup<'m, 'm>,
    attenuation: f64,
    aryl: Option<&'m Series>,
    visited: &'v mut Vec<bool>,
    unknown: usize,
    /// The site is an ammonium-type cation: groups take their `sigma_star_ammonium` where they
    /// have one.
    ammonium: bool,
}

impl Walk<'_, '_> {
    /// sigma* of the group rooted at `atom`, reached from `from`.
    fn group(&mut self, atom: usize, from: usize, depth: usize) -> f64 {
        if let Some((s, matched)) = self
            .look
            .at_with(atom, Some(from), Position::Attached)
            .and_then(|(row, m)| {
                let ammonium = row.sigma_star_ammonium.filter(|_| self.ammonium);
                ammonium.or(row.sigma_star).map(|s| (s, m))
            })
        {
            self.unknown += beyond_the_row(self.mol, atom, from, matched);
            return s + self.ring_substituents(atom, from);
        }
        if !self.saturated_carbon(atom) {
            self.unknown += 1;
            return 0.0;
        }
        if depth >= MAX_DEPTH {
            return 0.0;
        }
        self.visited[atom] = true;
        let mut sum = 0.0;
        for &(x, _) in &self.mol.adjacency[atom] {
            if x == from || self.visited[x] {
                continue;
            }
            let s = self.group(x, atom, depth + 1);
            sum += self.attenuation * s;
            if s <= 0.0 && self.saturated_carbon(x) {
                sum += ALKYL_STEP;
            }
        }
        sum
    }

    /// The sigma* change of a tabulated group that is an aryl ring (`atom` aromatic) or a
    /// saturated carbon bearing one (benzyl, damped once) from that ring's own substituents:
    /// `aryl.rho` times their Hammett sigma sum, seen from the atom that bears the chain.
    fn ring_substituents(&mut self, atom: usize, from: usize) -> f64 {
        let Some(aryl) = self.aryl else {
            return 0.0;
        };
        let (ipso, came_from, damping) = if self.mol.atoms[atom].aromatic {
            (atom, from, 1.0)
        } else if self.saturated_carbon(atom) {
            let mut rings = self.mol.adjacency[atom]
                .iter()
                .filter(|&&(x, _)| x != from && self.mol.atoms[x].aromatic);
            match (rings.next(), rings.next()) {
                (Some(&(x, _)), None) => (x, atom, self.attenuation),
                _ => return 0.0,
            }
        } else {
            return 0.0;
        };
        let Some(c) = hammett::aryl_terms(self.mol, ipso, came_from, aryl, self.look) else {
            return 0.0;
        };
        self.unknown += c.unknown;
        damping * aryl.rho * c.terms.iter().map(|t| t.sigma).sum::<f64>()
    }

    fn saturated_carbon(&self, atom: usize) -> bool {
        self.mol.is_saturated_carbon(atom)
    }
}
