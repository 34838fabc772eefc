#!/usr/bin/env python3
"""Writes tests/reference/formula.csv: molecular formula (rdMolDescriptors.CalcMolFormula) and
molar mass (Descriptors.MolWt, g/mol) per RDKit for a varied list of SMILES. Run from the
repository root:
    python3 tests/reference/make_formula_fixture.py
"""
import csv
import os

import rdkit
from rdkit import Chem
from rdkit.Chem import Descriptors, rdMolDescriptors

MOLECULES = [
    # acids and bases
    ("acetic acid", "CC(=O)O"),
    ("propionic acid", "CCC(=O)O"),
    ("oxalic acid", "OC(=O)C(=O)O"),
    ("trichloroacetic acid", "OC(=O)C(Cl)(Cl)Cl"),
    ("benzoic acid", "OC(=O)c1ccccc1"),
    ("4-nitrophenol", "Oc1ccc(cc1)[N+](=O)[O-]"),
    ("triethylamine", "CCN(CC)CC"),
    ("triethylamine hydrochloride", "CCN(CC)CC.Cl"),
    ("ethylammonium", "CC[NH3+]"),
    ("tetramethylammonium", "C[N+](C)(C)C"),
    ("morpholine", "C1COCCN1"),
    ("piperazine", "C1CNCCN1"),
    # salts and inorganic
    ("sodium acetate", "CC(=O)[O-].[Na+]"),
    ("sodium chloride", "[Na+].[Cl-]"),
    ("calcium chloride", "[Ca+2].[Cl-].[Cl-]"),
    ("ammonium sulfate", "[NH4+].[NH4+].[O-]S(=O)(=O)[O-]"),
    ("sulfate", "[O-]S(=O)(=O)[O-]"),
    ("sulfuric acid", "OS(=O)(=O)O"),
    ("phosphoric acid", "OP(=O)(O)O"),
    ("potassium dihydrogen phosphate", "[K+].OP(=O)(O)[O-]"),
    ("sodium bicarbonate", "[Na+].OC(=O)[O-]"),
    ("lithium carbonate", "[Li+].[Li+].[O-]C([O-])=O"),
    ("magnesium acetate", "[Mg+2].CC(=O)[O-].CC(=O)[O-]"),
    ("water", "O"),
    ("hydrogen bromide", "Br"),
    # halogens, S and P compounds
    ("chloroform", "ClC(Cl)Cl"),
    ("bromobenzene", "Brc1ccccc1"),
    ("iodoethane", "CCI"),
    ("fluorobenzene Kekulé", "FC1=CC=CC=C1"),
    ("trifluoroacetic acid", "OC(=O)C(F)(F)F"),
    ("dimethyl sulfoxide", "CS(C)=O"),
    ("methanesulfonic acid", "CS(=O)(=O)O"),
    ("thioanisole", "CSc1ccccc1"),
    ("triphenylphosphine oxide", "O=P(c1ccccc1)(c1ccccc1)c1ccccc1"),
    ("trimethyl phosphate", "COP(=O)(OC)OC"),
    ("boric acid", "OB(O)O"),
    ("tetramethylsilane", "C[Si](C)(C)C"),
    # heterocycles, Kekulé and aromatic spellings
    ("pyridine", "c1ccncc1"),
    ("pyridine Kekulé", "C1=CC=NC=C1"),
    ("pyridinium chloride", "c1cc[nH+]cc1.[Cl-]"),
    ("imidazole", "c1c[nH]cn1"),
    ("indole", "c1ccc2[nH]ccc2c1"),
    ("thiophene", "c1ccsc1"),
    ("caffeine", "Cn1c(=O)c2c(ncn2C)n(C)c1=O"),
    ("uracil Kekulé", "O=C1C=CNC(=O)N1"),
    # isotopes
    ("deuterated methanol", "[2H]C([2H])([2H])O"),
    ("13C-methane", "[13CH4]"),
    ("15N-ammonia", "[15NH3]"),
    ("18O-water", "[18OH2]"),
    ("tritiated water", "[3H]O"),
    ("14C-acetic acid", "[14CH3]C(=O)O"),
    ("34S-dimethyl sulfide", "C[34S]C"),
    ("37Cl-chloromethane", "C[37Cl]"),
    ("18F-fluoroethanol", "OCC[18F]"),
    ("125I-iodophenol", "Oc1ccc([125I])cc1"),
    # drug-like, of our own choosing
    ("paracetamol", "CC(=O)Nc1ccc(O)cc1"),
    ("lidocaine", "CCN(CC)CC(=O)Nc1c(C)cccc1C"),
    ("lidocaine hydrochloride", "CCN(CC)CC(=O)Nc1c(C)cccc1C.Cl"),
    ("metformin", "CN(C)C(=N)NC(N)=N"),
    ("sulfamethoxazole", "Cc1cc(NS(=O)(=O)c2ccc(N)cc2)no1"),
    ("furosemide", "NS(=O)(=O)c1cc(C(=O)O)c(NCc2ccco2)cc1Cl"),
    ("diclofenac sodium", "OC(=O)Cc1ccccc1Nc1c(Cl)cccc1Cl.[Na+].[OH-]"),
    ("quinine", "COc1ccc2nccc(C(O)C3CC4CCN3CC4C=C)c2c1"),
    ("propranolol", "CC(C)NCC(O)COc1cccc2ccccc12"),
    ("glycine zwitterion", "[NH3+]CC(=O)[O-]"),
    ("cysteine", "NC(CS)C(=O)O"),
    ("nicotine bitartrate-like pair", "CN1CCCC1c1cccnc1.OC(C(O)C(=O)O)C(=O)O"),
    ("stereo-marked alanine", "C[C@@H](N)C(=O)O"),
    ("explicit hydrogens", "[H]OC([H])([H])C"),
]


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = os.path.join(here, "formula.csv")
    with open(out, "w", newline="") as f:
        f.write(f"# Formula (rdMolDescriptors.CalcMolFormula) and molar mass (Descriptors.MolWt)\n")
        f.write(f"# per RDKit {rdkit.__version__}, written by tests/reference/make_formula_fixture.py.\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["name", "smiles", "formula", "molar_mass"])
        for name, smiles in MOLECULES:
            mol = Chem.MolFromSmiles(smiles)
            if mol is None:
                raise SystemExit(f"RDKit cannot read {name}: {smiles}")
            formula = rdMolDescriptors.CalcMolFormula(mol)
            w.writerow([name, smiles, formula, f"{Descriptors.MolWt(mol):.5f}"])
    print(f"wrote {len(MOLECULES)} rows to {out}")


if __name__ == "__main__":
    main()
