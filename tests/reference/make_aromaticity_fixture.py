#!/usr/bin/env python3
"""Writes tests/reference/aromaticity.csv: for each SMILES, the atoms RDKit perceives as aromatic
(RDKit's default aromaticity model), as indices in SMILES order.

RDKit keeps the SMILES atom order when parsing, and none of these strings has a plain [H] atom,
so the indices line up with phdose's. Run from the repository root:
    python3 tests/reference/make_aromaticity_fixture.py
"""
import csv
import os

import rdkit
from rdkit import Chem

MOLECULES = [
    # monocycles, Kekulé and aromatic spellings
    ("benzene", "c1ccccc1"),
    ("benzene Kekulé", "C1=CC=CC=C1"),
    ("phenol", "Oc1ccccc1"),
    ("phenol Kekulé", "OC1=CC=CC=C1"),
    ("pyridine", "c1ccncc1"),
    ("pyridine Kekulé", "C1=CC=NC=C1"),
    ("pyrrole", "c1cc[nH]c1"),
    ("pyrrole Kekulé", "C1=CNC=C1"),
    ("N-methylpyrrole", "Cn1cccc1"),
    ("furan", "c1ccoc1"),
    ("furan Kekulé", "C1=COC=C1"),
    ("thiophene", "c1ccsc1"),
    ("imidazole", "c1c[nH]cn1"),
    ("imidazole Kekulé", "C1=CN=CN1"),
    ("pyrazole", "c1cn[nH]c1"),
    ("thiazole", "c1cscn1"),
    ("oxazole", "c1cocn1"),
    ("isoxazole", "c1cnoc1"),
    ("1,2,4-triazole", "c1nc[nH]n1"),
    ("tetrazole", "c1nnn[nH]1"),
    ("5-methyltetrazolide", "Cc1nn[n-]n1"),
    ("pyrimidine", "c1cncnc1"),
    ("pyrazine", "c1cnccn1"),
    ("1,3,5-triazine", "c1ncncn1"),
    ("thiophene Kekulé", "C1=CSC=C1"),
    # charged rings
    ("cyclopentadienide", "[cH-]1cccc1"),
    ("cyclopentadienide Kekulé", "[CH-]1C=CC=C1"),
    ("tropylium", "[cH+]1cccccc1"),
    ("tropylium Kekulé", "[CH+]1C=CC=CC=C1"),
    ("cyclopropenyl cation", "[CH+]1C=C1"),
    ("pyridinium", "c1cc[nH+]cc1"),
    ("N-methylpyridinium", "C[n+]1ccccc1"),
    ("pyridine N-oxide", "[O-][n+]1ccccc1"),
    ("pyridine N-oxide Kekulé", "[O-][N+]1=CC=CC=C1"),
    ("imidazolium", "c1c[nH+]c[nH]1"),
    ("pyrylium", "c1cc[o+]cc1"),
    # fused
    ("naphthalene", "c1ccc2ccccc2c1"),
    ("naphthalene Kekulé", "C1=CC2=CC=CC=C2C=C1"),
    ("azulene", "c1ccc2cccc2cc1"),
    ("azulene Kekulé", "C1=CC2=CC=CC=CC2=C1"),
    ("anthracene", "c1ccc2cc3ccccc3cc2c1"),
    ("phenanthrene", "c1ccc2c(c1)ccc1ccccc12"),
    ("pyrene", "c1cc2ccc3cccc4ccc(c1)c2c34"),
    ("indole", "c1ccc2[nH]ccc2c1"),
    ("indole Kekulé", "C1=CC=C2NC=CC2=C1"),
    ("benzofuran", "c1ccc2occc2c1"),
    ("benzothiophene", "c1ccc2sccc2c1"),
    ("benzimidazole", "c1ccc2[nH]cnc2c1"),
    ("quinoline", "c1ccc2ncccc2c1"),
    ("isoquinoline", "c1ccc2cnccc2c1"),
    ("purine", "c1ncc2[nH]cnc2n1"),
    ("adenine", "Nc1ncnc2[nH]cnc12"),
    ("carbazole", "c1ccc2c(c1)[nH]c1ccccc12"),
    ("indolizine", "c1ccn2cccc2c1"),
    ("fluorene (CH2 breaks the 5-ring)", "C1c2ccccc2-c2ccccc12"),
    ("indene", "C1C=Cc2ccccc21"),
    ("tetralin", "C1CCc2ccccc2C1"),
    # carbonyls in rings
    ("2-pyridone", "O=c1cccc[nH]1"),
    ("2-pyridone Kekulé", "O=C1C=CC=CN1"),
    ("4-pyridone", "O=c1cc[nH]cc1"),
    ("uracil", "O=c1cc[nH]c(=O)[nH]1"),
    ("uracil Kekulé", "O=C1C=CNC(=O)N1"),
    ("thymine", "Cc1c[nH]c(=O)[nH]c1=O"),
    ("cytosine", "Nc1cc[nH]c(=O)n1"),
    ("caffeine", "Cn1c(=O)c2c(ncn2C)n(C)c1=O"),
    ("caffeine Kekulé", "CN1C(=O)C2=C(N=CN2C)N(C)C1=O"),
    ("barbituric acid", "O=C1CC(=O)NC(=O)N1"),
    ("p-benzoquinone", "O=C1C=CC(=O)C=C1"),
    ("o-benzoquinone", "O=C1C=CC=CC1=O"),
    ("1,4-naphthoquinone", "O=C1C=CC(=O)c2ccccc21"),
    ("anthraquinone", "O=C1c2ccccc2C(=O)c2ccccc21"),
    ("coumarin", "O=c1ccc2ccccc2o1"),
    ("2-quinolone", "O=c1ccc2ccccc2[nH]1"),
    ("tropone", "O=C1C=CC=CC=C1"),
    ("fulvene", "C=C1C=CC=C1"),
    ("phthalimide", "O=C1NC(=O)c2ccccc21"),
    ("isatin", "O=C1Nc2ccccc2C1=O"),
    # not aromatic
    ("cyclooctatetraene", "C1=CC=CC=CC=C1"),
    ("cyclohexa-1,3-diene", "C1=CCCC=C1"),
    ("cyclopentadiene", "C1=CCC=C1"),
    ("cyclohexane", "C1CCCCC1"),
    ("1,4-dihydropyridine", "C1=CNC=CC1"),
    ("2H-pyran", "C1=CCOC=C1"),
    ("morpholine", "C1COCCN1"),
    # drug-like, of our own choosing
    ("paracetamol", "CC(=O)Nc1ccc(O)cc1"),
    ("nicotine", "CN1CCCC1c1cccnc1"),
    ("metronidazole", "Cc1ncc([N+](=O)[O-])n1CCO"),
    ("sulfamethoxazole", "Cc1cc(NS(=O)(=O)c2ccc(N)cc2)no1"),
    ("ketoconazole fragment: 1-phenylimidazole", "c1ccc(-n2ccnc2)cc1"),
    ("nitrobenzene", "O=[N+]([O-])c1ccccc1"),
    ("benzoic acid", "OC(=O)c1ccccc1"),
    ("phenylalanine", "NC(Cc1ccccc1)C(=O)O"),
    ("tryptophan", "NC(Cc1c[nH]c2ccccc12)C(=O)O"),
    ("histidine", "NC(Cc1c[nH]cn1)C(=O)O"),
    ("thiamine-like thiazolium", "Cc1ncc(C[n+]2csc(CCO)c2C)c(N)n1"),
    ("biphenyl", "c1ccc(-c2ccccc2)cc1"),
    ("styrene", "C=Cc1ccccc1"),
    # more heterocycles, charged and carbonyl-bearing rings
    ("1,3,4-thiadiazole", "c1nncs1"),
    ("1,3,4-oxadiazole", "c1nnco1"),
    ("1-methyl-1,2,3-triazole", "c1cnnn1C"),
    ("benzotriazole", "c1ccc2[nH]nnc2c1"),
    ("4-quinazolinone", "O=c1[nH]cnc2ccccc12"),
    ("pteridine", "c1cnc2ncncc2n1"),
    ("flavone", "O=c1cc(-c2ccccc2)oc2ccccc12"),
    ("pyridazine", "c1ccnnc1"),
    ("phenothiazine", "c1ccc2c(c1)Sc1ccccc1N2"),
    ("acridine", "c1ccc2nc3ccccc3cc2c1"),
    ("4-pyranone", "O=c1ccocc1"),
    ("hydantoin", "O=C1CNC(=O)N1"),
    ("maleimide", "O=C1C=CC(=O)N1"),
    ("uric acid", "O=c1[nH]c(=O)c2[nH]cnc2[nH]1"),
    ("theophylline isomer", "Cn1cnc2c1c(=O)[nH]c(=O)n2C"),
    ("guanine", "Nc1nc2[nH]cnc2c(=O)[nH]1"),
    ("allopurinol", "O=c1[nH]cnc2[nH]ncc12"),
    ("tropolone", "O=c1cccccc1O"),
    ("2-aminothiazole", "Nc1nccs1"),
    ("saccharin", "O=C1NS(=O)(=O)c2ccccc21"),
    ("4-thiouracil", "S=c1cc[nH]c(=O)[nH]1"),
    ("2-pyridinethione", "S=c1cccc[nH]1"),
    ("phosphinine", "c1ccpcc1"),
    ("selenophene", "c1cc[se]c1"),
    ("cyclopropenone", "O=C1C=C1"),
    ("heptalene", "C1=CC=C2C=CC=C2C=C1"),
    ("fluoranthene", "c1ccc2c(c1)-c1cccc3cccc-2c13"),
    ("fluorenone", "O=C1c2ccccc2-c2ccccc21"),
    ("tetracene", "c1ccc2cc3cc4ccccc4cc3cc2c1"),
    ("tosylate", "Cc1ccc(cc1)S(=O)(=O)[O-]"),
    ("2-(pyrrol-2-yl)pyridine", "[nH]1cccc1-c1ccccn1"),
    ("coronene", "c1cc2ccc3ccc4ccc5ccc6ccc1c7c2c3c4c5c67"),
    ("phthalic anhydride", "O=C1OC(=O)c2ccccc12"),
    ("2-methyl-p-benzoquinone", "CC1=CC(=O)C=CC1=O"),
    ("quinazoline", "c1ccc2ncncc2c1"),
    ("benzonitrile", "N#Cc1ccccc1"),
    ("2-naphthol", "Oc1ccc2ccccc2c1"),
    ("phenoxide", "[O-]c1ccccc1"),
    ("pyrrolide", "c1cc[n-]c1"),
    ("pyrrolide Kekulé", "C1=C[N-]C=C1"),
    ("acetylsalicylic acid", "CC(=O)Oc1ccccc1C(=O)O"),
    ("benzoate", "O=C([O-])c1ccccc1"),
    ("2-phenylthiazole", "c1csc(n1)-c1ccccc1"),
    ("1,2-dihydronaphthalene-like ring: benzocycloheptene", "c1ccc2c(c1)C=CC=C2"),
    ("2-pyrimidinone", "O=C1N=CC=CN1"),
    ("4-pyrimidinone", "O=C1C=CN=CN1"),
    ("2-hydroxypyridine", "OC1=NC=CC=C1"),
    ("2-iminopyridine", "N=c1cccc[nH]1"),
    ("2-nitropyrrole", "O=[N+]([O-])c1ccc[nH]1"),
    ("1,3-dimethylimidazolium", "C[n+]1ccn(C)c1"),
    ("nitrenium ring (radical, not aromatic)", "C1=CC=[N+]C=C1"),
    ("thiopyrylium", "c1cc[s+]cc1"),
    ("chrysene", "c1ccc2c(c1)ccc1c2ccc2ccccc21"),
    ("alloxan", "O=C1NC(=O)C(=O)N1"),
    ("hypoxanthine tautomer", "O=c1nc[nH]c2nc[nH]c12"),
    ("beta-carboline", "c1ccc2c(c1)[nH]c1cnccc12"),
]


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = os.path.join(here, "aromaticity.csv")
    with open(out, "w", newline="") as f:
        f.write(f"# Aromatic atoms per RDKit {rdkit.__version__} (default aromaticity model),\n")
        f.write("# written by tests/reference/make_aromaticity_fixture.py; indices in SMILES order.\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["name", "smiles", "aromatic_atoms"])
        for name, smiles in MOLECULES:
            mol = Chem.MolFromSmiles(smiles)
            if mol is None:
                raise SystemExit(f"RDKit cannot read {name}: {smiles}")
            atoms = [a.GetIdx() for a in mol.GetAtoms() if a.GetIsAromatic()]
            w.writerow([name, smiles, " ".join(map(str, atoms))])
    print(f"wrote {len(MOLECULES)} rows to {out}")


if __name__ == "__main__":
    main()
