//! Lactim and lactam spellings of one compound: 2- and 4-hydroxypyridines, hydroxypyrimidines,
//! hydroxyquinolines and their thiol analogues are written either way, but in water the oxo
//! (thioxo) form with the proton on the ring N dominates by orders of magnitude (2-pyridone
//! over 2-hydroxypyridine about 900:1, 4-pyridone about 2000:1; Beak, Acc. Chem. Res. 1977,
//! from memory; common practice for all the hydroxyazines). Acid-base sites and measured
//! values are looked up on that form, so both spellings give one answer.
//!
//! The rule: an O-H or S-H on an aromatic carbon of a six-membered aromatic ring whose ring N
//! (pyridine-type: two ring bonds, no H, no charge) sits next to it or across from it (ortho
//! or para) gives its proton to that N; the C-O or C-S bond becomes double and the ring's
//! double bonds are placed anew. An ortho N is taken before a para one; each N takes one proton.

use super::kekule::place_double_bonds;
use super::molecule::{Molecule, Order};

/// Moves the protons of lactim-type O-H and S-H groups of `mol` to their ring N (see the
/// module doc). Returns how many were moved; atom indices do not change.
pub fn prefer_lactams(mol: &mut Molecule) -> usize {
    let mut moved = 0;
    for x in 0..mol.atoms.len() {
        if let Some((c, n)) = lactim(mol, x)
            && shift_proton(mol, x, c, n)
        {
            moved += 1;
        }
    }
    moved
}

/// For an O-H or S-H atom `x` on a lactim carbon: that carbon and the ring N to take the
/// proton.
fn lactim(mol: &Molecule, x: usize) -> Option<(usize, usize)> {
    let atom = &mol.atoms[x];
    if !matches!(atom.element, 8 | 16) || atom.charge != 0 || atom.hydrogens() != 1 {
        return None;
    }
    let [(c, bond)] = mol.adjacency[x][..] else {
        return None;
    };
    if mol.bonds[bond].order != Order::Single || !mol.atoms[c].aromatic {
        return None;
    }
    let pyridine_n = |a: usize| {
        let at = &mol.atoms[a];
        at.element == 7
            && at.aromatic
            && at.charge == 0
            && at.hydrogens() == 0
            && mol.adjacency[a].len() == 2
    };
    let rings = mol
        .rings
        .rings
        .iter()
        .filter(|r| r.len() == 6 && r.contains(&c) && r.iter().all(|&a| mol.atoms[a].aromatic));
    let mut para = None;
    for ring in rings {
        let i = ring.iter().position(|&a| a == c)?;
        // The two ortho neighbours in the ring, then the para atom.
        let [ortho_a, ortho_b, across] = [1, 5, 3].map(|step| ring[(i + step) % 6]);
        if let Some(n) = [ortho_a, ortho_b].into_iter().find(|&a| pyridine_n(a)) {
            return Some((c, n));
        }
        if pyridine_n(across) {
            para.get_or_insert((c, across));
        }
    }
    para
}

/// Moves the proton of `x` (on ring carbon `c`) to ring N `n` and places the ring's double
/// bonds anew; leaves `mol` unchanged and returns false when no placement fits.
fn shift_proton(mol: &mut Molecule, x: usize, c: usize, n: usize) -> bool {
    let need: Vec<bool> = (0..mol.atoms.len())
        .map(|i| {
            i != c
                && i != n
                && mol.adjacency[i]
                    .iter()
                    .any(|&(_, b)| mol.bonds[b].aromatic && mol.bonds[b].order == Order::Double)
        })
        .collect();
    let mut shifted = mol.clone();
    if !place_double_bonds(&mut shifted, &need) {
        return false;
    }
    let Some(&(_, bond)) = shifted.adjacency[x].first() else {
        return false;
    };
    shifted.bonds[bond].order = Order::Double;
    let donor = &mut shifted.atoms[x];
    if donor.explicit_hydrogens > 0 {
        donor.explicit_hydrogens -= 1;
    } else {
        donor.implicit_hydrogens -= 1;
    }
    shifted.atoms[n].explicit_hydrogens += 1;
    *mol = shifted;
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lactam_form(smiles: &str) -> (Molecule, usize) {
        let mut mol = Molecule::from_smiles(smiles).unwrap();
        let moved = prefer_lactams(&mut mol);
        (mol, moved)
    }

    #[test]
    fn hydroxypyridines_become_pyridones_and_phenols_stay() {
        for (lactim, lactam) in [
            ("Oc1ccccn1", "O=c1cccc[nH]1"),
            ("Oc1ccncc1", "O=c1cc[nH]cc1"),
            ("Oc1nc(O)ccn1", "O=c1cc[nH]c(=O)[nH]1"),
            ("Sc1ccccn1", "S=c1cccc[nH]1"),
            ("Oc1ccc2ccccc2n1", "O=c1ccc2ccccc2[nH]1"),
        ] {
            let (mol, moved) = lactam_form(lactim);
            assert!(moved > 0, "{lactim}");
            let expected = Molecule::from_smiles(lactam).unwrap();
            let hs = |m: &Molecule| {
                let mut h: Vec<(u8, u8)> =
                    m.atoms.iter().map(|a| (a.element, a.hydrogens())).collect();
                h.sort();
                h
            };
            assert_eq!(hs(&mol), hs(&expected), "{lactim}");
            let doubles = |m: &Molecule| {
                m.bonds
                    .iter()
                    .filter(|b| b.order == Order::Double && !b.aromatic)
                    .count()
            };
            assert_eq!(doubles(&mol), doubles(&expected), "{lactim}");
        }
        for stays in ["Oc1ccccc1", "Oc1cccnc1", "Oc1cccc2cccnc12", "O=c1cccc[nH]1"] {
            assert_eq!(lactam_form(stays).1, 0, "{stays}");
        }
    }
}
